package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
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
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.delivery.Mosquitto;

/**
 * The live-view page in a real browser: Debian's Chromium, headless, driven over the Chrome DevTools Protocol
 * (Input.dispatchMouseEvent for the clicks and the drag, Runtime.evaluate to read the page, Page.captureScreenshot)
 * through the JDK's WebSocket client. The page shows the camera's picture, a zone drawn with simulated mouse
 * events gives the expected TOML snippet, and its live chart gets measurements. The screenshot is kept in
 * target/live-view.png.
 */
class LiveViewIT {
    private static final String TOKEN = "yard-view-token-7";

    /** A minimal CDP session: one page target, commands answered by id. */
    private static final class Cdp implements WebSocket.Listener {
        private final Map<Integer, CompletableFuture<String>> waiting = new ConcurrentHashMap<>();
        private final AtomicInteger ids = new AtomicInteger();
        private final StringBuilder partial = new StringBuilder();
        private WebSocket socket;

        static Cdp connect(String url) throws Exception {
            Cdp c = new Cdp();
            c.socket = HttpClient.newHttpClient().newWebSocketBuilder().buildAsync(URI.create(url), c)
                    .get(10, TimeUnit.SECONDS);
            return c;
        }

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

        /** Evaluates an expression in the page; returns its value as a string (String(value)). */
        String eval(String expression) throws Exception {
            String a = call("Runtime.evaluate", "{\"expression\":" + quote("String(" + expression + ")")
                    + ",\"returnByValue\":true}");
            Matcher m = Pattern.compile("\"value\":\"((?:[^\"\\\\]|\\\\.)*)\"").matcher(a);
            if (!m.find()) {
                throw new AssertionError(expression + ": " + a);
            }
            return m.group(1).replace("\\n", "\n").replace("\\\"", "\"").replace("\\\\", "\\");
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
    }

    static String quote(String s) {
        return "\"" + s.replace("\\", "\\\\").replace("\"", "\\\"").replace("\n", "\\n") + "\"";
    }

    private static String get(String url) throws Exception {
        return HttpClient.newHttpClient().send(HttpRequest.newBuilder(URI.create(url)).timeout(Duration.ofSeconds(5))
                .build(), HttpResponse.BodyHandlers.ofString()).body();
    }

    private static String await(Cdp cdp, String expression, Pattern until, long seconds) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(seconds);
        String v = "";
        while (System.nanoTime() < deadline) {
            v = cdp.eval(expression);
            if (until.matcher(v).matches()) {
                return v;
            }
            TimeUnit.MILLISECONDS.sleep(200); // polling the page, not a synchronisation sleep
        }
        throw new AssertionError(expression + " stayed " + v);
    }

    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void aZoneDrawnWithTheMouseGivesItsTomlAndTheChartMoves(@TempDir Path dir) throws Exception {
        Files.writeString(dir.resolve("status.token"), TOKEN);
        int port = Mosquitto.freePort();
        String config = Files.readString(YardSite.config(dir, YardSite.clip().toString(),
                "http = \"127.0.0.1:" + port + "\"", "token_file = \"status.token\"", "[clips]", "enabled = false"))
                .replace("source = ", "loop = true\nsource = ");
        Path site = dir.resolve("site.toml");
        Files.writeString(site, config);
        Process service = YardSite.startService(dir, site);
        int debugPort = Mosquitto.freePort();
        Process browser = new ProcessBuilder("chromium", "--headless=new", "--no-sandbox", "--disable-gpu",
                "--disable-dev-shm-usage", "--remote-debugging-port=" + debugPort,
                "--user-data-dir=" + dir.resolve("chromium"), "--window-size=1400,900", "about:blank")
                .redirectErrorStream(true).redirectOutput(dir.resolve("chromium.log").toFile()).start();
        try {
            String list = "";
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
            while (!list.contains("\"type\": \"page\"") && System.nanoTime() < deadline) {
                try {
                    list = get("http://127.0.0.1:" + debugPort + "/json/list");
                } catch (java.io.IOException notYet) {
                    TimeUnit.MILLISECONDS.sleep(200); // polling for the browser, not a synchronisation sleep
                }
            }
            Matcher ws = Pattern.compile("\"webSocketDebuggerUrl\": \"(ws://[^\"]+/page/[^\"]+)\"").matcher(list);
            assertTrue(ws.find(), list + Files.readString(dir.resolve("chromium.log")));
            Cdp cdp = Cdp.connect(ws.group(1));
            cdp.call("Page.enable", "{}");
            // the camera list: one camera with one zone, in the singular, its one stream's size (the demo clip is
            // 640x360, ffprobe) and no "lost" for a camera that is watching
            cdp.call("Page.navigate", "{\"url\":\"http://127.0.0.1:" + port + "/?access_token=" + TOKEN + "\"}");
            await(cdp, "(document.getElementById('cameras') || {textContent: ''}).textContent.replace(/\\u2014/g, '-')",
                    Pattern.compile("yard-mast-2 - 1 zone - 640x360 analysed"), 30);
            cdp.call("Page.navigate", "{\"url\":\"http://127.0.0.1:" + port + "/view/yard-mast-2?access_token=" + TOKEN + "\"}");
            // the live picture arrived (the MJPEG stream's first frame gives the image its size)
            await(cdp, "(document.getElementById('picture') || {naturalWidth: 0}).naturalWidth", Pattern.compile("[1-9]\\d*"), 60);

            String measure = "(() => { const r = document.getElementById('draw').getBoundingClientRect();"
                    + " return [r.left, r.top, r.width, r.height].join(','); })()";
            // the page lays the drawing surface out again once the picture's size is known: measure until two
            // readings agree (once measured mid-layout, every click landed at half its place)
            String rect = cdp.eval(measure);
            for (int i = 0; i < 25; i++) {
                TimeUnit.MILLISECONDS.sleep(200); // polling the layout, not a synchronisation sleep
                String again = cdp.eval(measure);
                if (again.equals(rect)) {
                    break;
                }
                rect = again;
            }
            String[] r = rect.split(",");
            double left = Double.parseDouble(r[0]);
            double top = Double.parseDouble(r[1]);
            double width = Double.parseDouble(r[2]);
            double height = Double.parseDouble(r[3]);
            assertTrue(width > 300 && height > 150, rect);
            double[][] corners = {{0.20, 0.90}, {0.80, 0.90}, {0.60, 0.20}, {0.40, 0.20}};
            for (double[] c : corners) {
                cdp.click(left + c[0] * width, top + c[1] * height);
            }
            cdp.click(left + 0.20 * width, top + 0.90 * height); // the first corner again closes the zone
            // drag up and to the right at 45°: the permitted heading
            double cx = left + 0.5 * width;
            double cy = top + 0.6 * height;
            cdp.mouse("mousePressed", cx, cy, 1);
            cdp.mouse("mouseMoved", cx + 30, cy - 30, 1);
            cdp.mouse("mouseMoved", cx + 60, cy - 60, 1);
            cdp.mouse("mouseReleased", cx + 60, cy - 60, 0);

            String snippet = cdp.eval("window.waywardSnippet()");
            assertEquals(String.join("\n", "[[camera.zone]]", "id = \"new-zone\"",
                    "polygon = [[0.20, 0.90], [0.80, 0.90], [0.60, 0.20], [0.40, 0.20]]", "heading_deg = 45", ""),
                    snippet);
            // the chart gets measurements of the drawn zone from /api/measure
            await(cdp, "series.filter(s => s.moving_share !== null).length >= 3", Pattern.compile("true"), 20);

            // a configured zone, moved: its first corner dragged from (0.31, 0.98) to (0.25, 0.95)
            await(cdp, "document.getElementById('existing').options.length", Pattern.compile("2"), 20);
            cdp.eval("(() => { const s = document.getElementById('existing'); s.value = 'lane-2-out';"
                    + " document.getElementById('edit').click(); return s.value; })()");
            cdp.mouse("mousePressed", left + 0.31 * width, top + 0.98 * height, 1);
            cdp.mouse("mouseMoved", left + 0.28 * width, top + 0.965 * height, 1);
            cdp.mouse("mouseMoved", left + 0.25 * width, top + 0.95 * height, 1);
            cdp.mouse("mouseReleased", left + 0.25 * width, top + 0.95 * height, 0);
            assertEquals(String.join("\n", "[[camera.zone]]", "id = \"lane-2-out\"",
                    "polygon = [[0.25, 0.95], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]", "heading_deg = 0", ""),
                    cdp.eval("window.waywardSnippet()"));

            // the drawn zone, read from the drawing surface itself: there, and black and white only (every hue
            // is a direction on the colour wheel)
            String drawn = cdp.eval("(() => { const c = document.getElementById('draw');"
                    + " const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;"
                    + " let opaque = 0, hued = 0; for (let i = 0; i < d.length; i += 4) { if (d[i + 3] < 200) continue;"
                    + " opaque++; if (Math.max(d[i], d[i + 1], d[i + 2]) - Math.min(d[i], d[i + 1], d[i + 2]) > 30) hued++; }"
                    + " return opaque + ' ' + hued; })()");
            String[] counts = drawn.split(" ");
            assertTrue(Integer.parseInt(counts[0]) > 400, "the drawn zone shows: " + drawn);
            assertEquals("0", counts[1], "hued pixels of the drawn zone (opaque, hued): " + drawn);
            // the flow arrows, within the picture (the page's colour legend lies beside it). The demo clip has still
            // stretches of seconds (between the tug and the truck, after the van): screenshots are taken until one
            // shows arrows, for up to 40 s (the clip loops every 26 s)
            int coloured = 0;
            long arrowsDeadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(40);
            while (coloured <= 50 && System.nanoTime() < arrowsDeadline) {
                BufferedImage img = screenshot(cdp);
                coloured = colouredSamples(img, left, top, width, height);
                if (coloured <= 50) {
                    TimeUnit.MILLISECONDS.sleep(500); // polling the live picture, not a synchronisation sleep
                }
            }
            assertTrue(coloured > 50, "flow arrows show: " + coloured + " coloured samples");
            // the colour legend beside the picture has arrived and is the wheel (WheelLegendTest checks its pixels)
            assertEquals("65", cdp.eval("document.getElementById('wheel').naturalWidth"));
        } finally {
            browser.destroyForcibly();
            service.destroy();
            service.waitFor(20, TimeUnit.SECONDS);
        }
    }

    /** The page as the browser draws it (also kept as target/live-view.png). */
    private static BufferedImage screenshot(Cdp cdp) throws Exception {
        String shot = cdp.call("Page.captureScreenshot", "{\"format\":\"png\"}");
        Matcher data = Pattern.compile("\"data\":\"([^\"]+)\"").matcher(shot);
        assertTrue(data.find());
        byte[] png = Base64.getDecoder().decode(data.group(1));
        Files.write(ProcessRunner.projectDir().resolve("target/live-view.png"), png);
        return ImageIO.read(new ByteArrayInputStream(png));
    }

    /** Samples (every 2nd pixel each way) inside the picture's box whose colour is far from grey. */
    private static int colouredSamples(BufferedImage img, double left, double top, double width, double height) {
        int coloured = 0;
        for (int y = (int) top; y < Math.min(img.getHeight(), top + height); y += 2) {
            for (int x = (int) left; x < Math.min(img.getWidth(), left + width); x += 2) {
                int rgb = img.getRGB(x, y);
                int red = (rgb >> 16) & 0xff;
                int green = (rgb >> 8) & 0xff;
                int blue = rgb & 0xff;
                if (Math.max(red, Math.max(green, blue)) - Math.min(red, Math.min(green, blue)) > 60) {
                    coloured++;
                }
            }
        }
        return coloured;
    }
}
