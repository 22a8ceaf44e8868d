package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.net.http.WebSocket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Base64;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CompletionStage;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.imageio.ImageIO;
import wayward.delivery.Mosquitto;

/**
 * Debian's Chromium, headless, driven over the Chrome DevTools Protocol (CDP) through the JDK's WebSocket client:
 * one page target, commands answered by id ({@code Runtime.evaluate} to read the page,
 * {@code Input.dispatchMouseEvent} for clicks and drags, {@code Page.captureScreenshot}). The browser's output goes
 * to chromium.log in the test's folder. Close it to end the browser.
 */
final class Chromium implements AutoCloseable, WebSocket.Listener {
    private final Map<Integer, CompletableFuture<String>> waiting = new ConcurrentHashMap<>();
    private final AtomicInteger ids = new AtomicInteger();
    private final StringBuilder partial = new StringBuilder();
    private final Process browser;
    private WebSocket socket;

    private Chromium(Process browser) {
        this.browser = browser;
    }

    /** Starts the browser with its profile and log in {@code dir} and connects to its one page (within 30 s). */
    static Chromium start(Path dir, int width, int height) throws Exception {
        int debugPort = Mosquitto.freePort();
        Process p = new ProcessBuilder("chromium", "--headless=new", "--no-sandbox", "--disable-gpu",
                "--disable-dev-shm-usage", "--remote-debugging-port=" + debugPort,
                "--user-data-dir=" + dir.resolve("chromium"), "--window-size=" + width + "," + height, "about:blank")
                .redirectErrorStream(true).redirectOutput(dir.resolve("chromium.log").toFile()).start();
        Chromium c = new Chromium(p);
        try {
            String list = "";
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
            while (!list.contains("\"type\": \"page\"") && System.nanoTime() < deadline) {
                try {
                    list = get("http://127.0.0.1:" + debugPort + "/json/list");
                } catch (IOException notYet) {
                    TimeUnit.MILLISECONDS.sleep(200); // polling for the browser, not a synchronisation sleep
                }
            }
            Matcher ws = Pattern.compile("\"webSocketDebuggerUrl\": \"(ws://[^\"]+/page/[^\"]+)\"").matcher(list);
            assertTrue(ws.find(), list + Files.readString(dir.resolve("chromium.log")));
            c.socket = HttpClient.newHttpClient().newWebSocketBuilder().buildAsync(URI.create(ws.group(1)), c)
                    .get(10, TimeUnit.SECONDS);
            c.call("Page.enable", "{}");
            return c;
        } catch (Exception | AssertionError e) {
            p.destroyForcibly();
            throw e;
        }
    }

    private static String get(String url) throws Exception {
        return HttpClient.newHttpClient().send(HttpRequest.newBuilder(URI.create(url)).timeout(Duration.ofSeconds(5))
                .build(), HttpResponse.BodyHandlers.ofString()).body();
    }

    /** Sends one CDP command; returns its answer (JSON text); a CDP error fails the test. */
    String call(String method, String params) throws Exception {
        int id = ids.incrementAndGet();
        CompletableFuture<String> f = new CompletableFuture<>();
        waiting.put(id, f);
        socket.sendText("{\"id\":" + id + ",\"method\":\"" + method + "\",\"params\":" + params + "}", true)
                .get(10, TimeUnit.SECONDS);
        String answer = f.get(30, TimeUnit.SECONDS);
        if (answer.contains("\"error\":")) {
            throw new AssertionError(method + ": " + answer);
        }
        return answer;
    }

    /** Opens an address in the page. */
    void navigate(String url) throws Exception {
        call("Page.navigate", "{\"url\":" + quote(url) + "}");
    }

    /** Evaluates an expression in the page; returns its value as a string (String(value)). */
    String eval(String expression) throws Exception {
        String a = call("Runtime.evaluate", "{\"expression\":" + quote("String(" + expression + ")")
                + ",\"returnByValue\":true}");
        Matcher m = Pattern.compile("\"value\":\"((?:[^\"\\\\]|\\\\.)*)\"").matcher(a);
        if (!m.find()) {
            throw new AssertionError(expression + ": " + a);
        }
        return unescape(m.group(1));
    }

    /** A JSON string's content without its escapes (RFC 8259 §7). */
    static String unescape(String s) {
        StringBuilder b = new StringBuilder(s.length());
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c != '\\' || i + 1 == s.length()) {
                b.append(c);
                continue;
            }
            char e = s.charAt(++i);
            switch (e) {
                case 'n' -> b.append('\n');
                case 't' -> b.append('\t');
                case 'r' -> b.append('\r');
                case 'b' -> b.append('\b');
                case 'f' -> b.append('\f');
                case 'u' -> {
                    b.append((char) Integer.parseInt(s.substring(i + 1, i + 5), 16));
                    i += 4;
                }
                default -> b.append(e); // \" \\ \/
            }
        }
        return b.toString();
    }

    /** Evaluates the expression every 200 ms until its value matches; returns it (fails after the time). */
    String await(String expression, Pattern until, long seconds) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(seconds);
        String v = "";
        while (System.nanoTime() < deadline) {
            v = eval(expression);
            if (until.matcher(v).matches()) {
                return v;
            }
            TimeUnit.MILLISECONDS.sleep(200); // polling the page, not a synchronisation sleep
        }
        throw new AssertionError(expression + " stayed " + v);
    }

    void mouse(String type, double x, double y, int buttons) throws Exception {
        call("Input.dispatchMouseEvent", String.format(java.util.Locale.ROOT,
                "{\"type\":\"%s\",\"x\":%.2f,\"y\":%.2f,\"button\":\"left\",\"buttons\":%d,\"clickCount\":1}",
                type, x, y, buttons));
    }

    void click(double x, double y) throws Exception {
        mouse("mousePressed", x, y, 1);
        mouse("mouseReleased", x, y, 0);
    }

    /** The page as the browser draws it; also written to {@code keep} (PNG) when not null. */
    BufferedImage screenshot(Path keep) throws Exception {
        String shot = call("Page.captureScreenshot", "{\"format\":\"png\"}");
        Matcher data = Pattern.compile("\"data\":\"([^\"]+)\"").matcher(shot);
        assertTrue(data.find());
        byte[] png = Base64.getDecoder().decode(data.group(1));
        if (keep != null) {
            Files.write(keep, png);
        }
        return ImageIO.read(new ByteArrayInputStream(png));
    }

    static String quote(String s) {
        return "\"" + s.replace("\\", "\\\\").replace("\"", "\\\"").replace("\n", "\\n") + "\"";
    }

    @Override
    public CompletionStage<?> onText(WebSocket ws, CharSequence data, boolean last) {
        partial.append(data);
        if (last) {
            String msg = partial.toString();
            partial.setLength(0);
            Matcher m = Pattern.compile("^\\{\"id\":(\\d+),").matcher(msg);
            if (m.find()) {
                CompletableFuture<String> f = waiting.remove(Integer.parseInt(m.group(1)));
                if (f != null) {
                    f.complete(msg);
                }
            }
        }
        ws.request(1);
        return null;
    }

    @Override
    public void close() {
        browser.destroyForcibly();
    }
}
