package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.InputStream;
import java.io.OutputStream;
import java.net.Socket;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Arrays;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.delivery.Mosquitto;

/**
 * The status server of the running service ({@code run}, packaged jar), asked by the JDK's HTTP client and
 * by raw sockets: health without a token, everything else only with it; /metrics accepted by promtool
 * (Debian's prometheus package); clip download with byte ranges (RFC 9110 §14); traversal attempts, an
 * oversized request line and headers, and other methods refused with 4xx.
 */
class StatusServerIT {
    private static final String TOKEN = "yard-status-token-42";
    private final HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(5)).build();

    private HttpResponse<byte[]> get(int port, String path, String token, String... headers) throws Exception {
        HttpRequest.Builder b = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + path))
                .timeout(Duration.ofSeconds(10));
        if (token != null) {
            b.header("Authorization", "Bearer " + token);
        }
        for (int i = 0; i < headers.length; i += 2) {
            b.header(headers[i], headers[i + 1]);
        }
        return http.send(b.build(), HttpResponse.BodyHandlers.ofByteArray());
    }

    private static String text(HttpResponse<byte[]> r) {
        return new String(r.body(), StandardCharsets.UTF_8);
    }

    /** Sends raw bytes and returns the status line of the answer. */
    private static String raw(int port, String request) throws Exception {
        try (Socket s = new Socket("127.0.0.1", port)) {
            s.setSoTimeout(10_000);
            OutputStream out = s.getOutputStream();
            out.write(request.getBytes(StandardCharsets.ISO_8859_1));
            out.flush();
            InputStream in = s.getInputStream();
            StringBuilder line = new StringBuilder();
            for (int c; (c = in.read()) >= 0 && c != '\n'; ) {
                line.append((char) c);
            }
            return line.toString().trim();
        }
    }

    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void healthMetricsApiAndClipsWithTheTokenAndNothingElse(@TempDir Path dir) throws Exception {
        Files.writeString(dir.resolve("status.token"), TOKEN + "\n");
        Files.writeString(dir.resolve("secret.txt"), "not for the web\n");
        int port = freePort();
        Path config = YardSite.config(dir, YardSite.clip().toString(), "http = \"127.0.0.1:" + port + "\"",
                "token_file = \"status.token\"");
        Process service = YardSite.startService(dir, config);
        try {
            awaitUp(port);
            HttpResponse<byte[]> health = get(port, "/health", null);
            assertEquals(200, health.statusCode());
            assertTrue(text(health).startsWith("{\"alive\":true,"), text(health));

            assertEquals(401, get(port, "/metrics", null).statusCode());
            assertEquals(401, get(port, "/api/cameras", "wrong-token").statusCode());
            assertEquals("Bearer realm=\"wayward\"",
                    get(port, "/api/cameras", null).headers().firstValue("WWW-Authenticate").orElse(""));

            Path log = dir.resolve("data/events.jsonl");
            YardSite.awaitEvent(log, "wrong_way", "end", 1, 90);
            HttpResponse<byte[]> metrics = get(port, "/metrics", TOKEN);
            assertEquals(200, metrics.statusCode());
            assertTrue(metrics.headers().firstValue("Content-Type").orElse("").startsWith("text/plain; version=0.0.4"));
            Path m = dir.resolve("metrics.txt");
            Files.write(m, metrics.body());
            // promtool (Prometheus 2.42, Debian) parses the exposition format and lints names, HELP and TYPE
            String lint = YardSite.command("sh", "-c", "promtool check metrics < " + m);
            assertEquals("", lint, "promtool found nothing to say");
            String body = text(metrics);
            assertTrue(body.contains("wayward_zone_events_total{camera=\"yard-mast-2\",zone=\"lane-2-out\"} 1\n"), body);
            assertTrue(body.contains("wayward_camera_frames_analysed_total{camera=\"yard-mast-2\"} "), body);
            // the shared vocabulary: watching / lost, moving and against share, evidence; frames, not pictures
            assertTrue(body.contains("wayward_camera_watching{camera=\"yard-mast-2\"} 1\n"), body);
            assertTrue(body.contains("wayward_zone_moving_share{camera=\"yard-mast-2\",zone=\"lane-2-out\"} "), body);
            assertTrue(body.contains("wayward_zone_against_share{camera=\"yard-mast-2\",zone=\"lane-2-out\"} "), body);
            assertTrue(body.contains("wayward_evidence_failed_total{file=\"clip\"} 0\n"), body);
            assertTrue(!body.contains("wayward_camera_analysis_fps{camera=\"yard-mast-2\"} NaN"), body);
            assertTrue(!body.contains("Pictures") && !body.contains("pictures"), body);
            // frames whose flow the still-frame gate skipped: a counter of its own, never more than were analysed
            double still = sampleOf(body, "wayward_camera_frames_still_total{camera=\"yard-mast-2\"}");
            double analysed = sampleOf(body, "wayward_camera_frames_analysed_total{camera=\"yard-mast-2\"}");
            assertTrue(still >= 0 && still <= analysed, still + " still of " + analysed + " analysed");

            String cameras = text(get(port, "/api/cameras", TOKEN));
            assertTrue(cameras.startsWith("{\"cameras\":[{\"id\":\"yard-mast-2\""), cameras);
            assertTrue(cameras.contains("\"events\":1"), cameras);
            String events = text(get(port, "/api/events?limit=5", TOKEN));
            assertEquals(Files.readAllLines(log).size(), events.split("\"phase\"").length - 1, events);
            assertEquals(400, get(port, "/api/events?limit=0", TOKEN).statusCode());

            // the clip, once its post-roll is written
            String clip = null;
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
            while (clip == null && System.nanoTime() < deadline) {
                String list = text(get(port, "/api/evidence", TOKEN));
                java.util.regex.Matcher found = java.util.regex.Pattern.compile("\"url\":\"(/evidence/[^\"]+\\.mp4)\"")
                        .matcher(list);
                if (found.find()) {
                    clip = found.group(1);
                }
                TimeUnit.MILLISECONDS.sleep(200); // polling for the clip, not a synchronisation sleep
            }
            assertTrue(clip != null, "a clip is listed");
            byte[] whole = Files.readAllBytes(dir.resolve("data").resolve(clip.substring(1)));
            HttpResponse<byte[]> all = get(port, clip, TOKEN);
            assertEquals(200, all.statusCode());
            assertArrayEquals(whole, all.body());
            HttpResponse<byte[]> part = get(port, clip, TOKEN, "Range", "bytes=100-1099");
            assertEquals(206, part.statusCode());
            assertEquals("bytes 100-1099/" + whole.length, part.headers().firstValue("Content-Range").orElse(""));
            assertArrayEquals(Arrays.copyOfRange(whole, 100, 1100), part.body());
            HttpResponse<byte[]> tail = get(port, clip, TOKEN, "Range", "bytes=-10");
            assertArrayEquals(Arrays.copyOfRange(whole, whole.length - 10, whole.length), tail.body());
            assertEquals(416, get(port, clip, TOKEN, "Range", "bytes=" + whole.length + "-").statusCode());

            // nothing outside the evidence folder, however the path is spelled
            for (String attempt : new String[] {"/evidence/../site.toml", "/evidence/%2e%2e/%2e%2e/secret.txt",
                    "/evidence/..%2f..%2fsecret.txt", "/evidence/%2fetc%2fpasswd", "/evidence/x%00.mp4", "/site.toml"}) {
                String status = raw(port, "GET " + attempt + " HTTP/1.1\r\nHost: x\r\nAuthorization: Bearer "
                        + TOKEN + "\r\nConnection: close\r\n\r\n");
                assertTrue(status.startsWith("HTTP/1.1 404") || status.startsWith("HTTP/1.1 400"),
                        attempt + " → " + status);
            }
            assertTrue(raw(port, "GET /" + "a".repeat(5000) + " HTTP/1.1\r\nHost: x\r\n\r\n")
                    .startsWith("HTTP/1.1 414"), "request line over 4 KiB");
            assertTrue(raw(port, "GET /health HTTP/1.1\r\nHost: x\r\nX-Filler: " + "b".repeat(9000) + "\r\n\r\n")
                    .startsWith("HTTP/1.1 431"), "headers over 8 KiB");
            assertTrue(raw(port, "POST /metrics HTTP/1.1\r\nHost: x\r\nContent-Length: 4\r\n\r\nabcd")
                    .startsWith("HTTP/1.1 405"), "only GET and HEAD");
            assertTrue(raw(port, "POST /metrics HTTP/1.1\r\nHost: x\r\nContent-Length: 20000\r\n\r\n")
                    .startsWith("HTTP/1.1 413"), "bodies over 16 KiB");
        } finally {
            service.destroy();
            service.waitFor(20, TimeUnit.SECONDS);
        }
    }

    private void awaitUp(int port) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
        while (System.nanoTime() < deadline) {
            try {
                if (get(port, "/health", null).statusCode() == 200) {
                    return;
                }
            } catch (java.io.IOException notYet) {
                TimeUnit.MILLISECONDS.sleep(100); // polling for the server, not a synchronisation sleep
            }
        }
        throw new AssertionError("status server not up on " + port);
    }

    private static int freePort() throws Exception {
        return Mosquitto.freePort(); // below the ephemeral range, as for the broker
    }

    /** The value of one sample line ("name{labels} value") of a Prometheus text answer; fails when it is missing. */
    private static double sampleOf(String body, String series) {
        for (String line : body.split("\n")) {
            if (line.startsWith(series + " ")) {
                return Double.parseDouble(line.substring(series.length() + 1).trim());
            }
        }
        throw new AssertionError(series + " missing in\n" + body);
    }
}
