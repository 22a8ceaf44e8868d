package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.sun.net.httpserver.HttpServer;
import java.net.InetSocketAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.testing.SchemaCheck;

/**
 * The service ({@code run}) on the packaged jar with a file camera and a webhook receiver on loopback (the
 * JDK's com.sun.net.httpserver) that fails its first request with 500: both phases arrive, in order, and name
 * the evidence clip, checked with ffprobe (Debian's ffmpeg), its snapshot and its sidecar.
 */
class RunWebhookIT {
    private static void checkEvidence(Path data, Map<String, Object> start, Map<String, Object> end, List<String> log)
            throws Exception {
        assertEquals(start.get("clip"), end.get("clip"), "both phases name the same clip");
        Path clip = data.resolve((String) end.get("clip"));
        Path snapshot = data.resolve((String) end.get("snapshot"));
        assertTrue(Files.isRegularFile(clip), clip.toString());
        // ffprobe: the first packet is a keyframe at pts 0
        String first = YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-read_intervals", "%+#1",
                "-show_entries", "packet=pts_time,flags", "-of", "csv=p=0", clip.toString());
        assertTrue(first.startsWith("0.000000,K"), first);
        double duration = Double.parseDouble(YardSite.command("ffprobe", "-v", "error", "-show_entries", "format=duration",
                "-of", "csv=p=0", clip.toString()));
        int packets = Integer.parseInt(YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-count_packets",
                "-show_entries", "stream=nb_read_packets", "-of", "csv=p=0", clip.toString()));
        // from the keyframe at or before start − 3 s pre-roll to end + 4 s post-roll; the clip's GOP is 2 s
        // (test-streams/yard-lane.scene.toml: 15 fps, keyframe every 30 frames)
        double span = (Double) end.get("stream_s") + 4 - ((Double) start.get("stream_s") - 3);
        assertTrue(duration >= span && duration <= span + 2.0, "clip " + duration + " s for a span of " + span + " s");
        assertEquals(duration * 15, packets, 1.5, "frame count matches the source's 15 fps over the clip");
        assertEquals("", YardSite.command("ffmpeg", "-v", "error", "-i", clip.toString(), "-f", "null", "-"), "decodes cleanly");
        java.awt.image.BufferedImage jpg = javax.imageio.ImageIO.read(snapshot.toFile());
        assertEquals(640, jpg.getWidth());
        // the 320 x 180 analysis picture at twice its size, the caption band below it
        int band = wayward.clip.Snapshot.BAND_HEIGHT;
        assertEquals(360 + band, jpg.getHeight());
        int coloured = 0;
        for (int y = 0; y < jpg.getHeight() - band; y += 2) {
            for (int x = 0; x < jpg.getWidth(); x += 2) {
                int rgb = jpg.getRGB(x, y);
                int r = (rgb >> 16) & 0xff;
                int g = (rgb >> 8) & 0xff;
                int b = rgb & 0xff;
                if (Math.max(r, Math.max(g, b)) - Math.min(r, Math.min(g, b)) > 60) {
                    coloured++;
                }
            }
        }
        assertTrue(coloured > 50, "motion arrows drawn on the gray frame: " + coloured + " coloured samples");
        int legend = 0;
        for (int y = jpg.getHeight() - band; y < jpg.getHeight(); y += 2) {
            for (int x = jpg.getWidth() / 2; x < jpg.getWidth(); x += 2) {
                int rgb = jpg.getRGB(x, y);
                int r = (rgb >> 16) & 0xff;
                int g = (rgb >> 8) & 0xff;
                int b = rgb & 0xff;
                legend += Math.max(r, Math.max(g, b)) - Math.min(r, Math.min(g, b)) > 60 ? 1 : 0;
            }
        }
        assertTrue(legend > 200, "the colour wheel in the caption band: " + legend + " coloured samples");
        Path sidecar = data.resolve(((String) end.get("clip")).replace(".mp4", ".json"));
        // one JSON document (RFC 8259 text, read whole by Jackson with trailing content refused) holding both
        // records as the event log has them
        com.fasterxml.jackson.databind.ObjectMapper json = new com.fasterxml.jackson.databind.ObjectMapper()
                .enable(com.fasterxml.jackson.databind.DeserializationFeature.FAIL_ON_TRAILING_TOKENS);
        com.fasterxml.jackson.databind.JsonNode doc = json.readTree(Files.readString(sidecar, StandardCharsets.UTF_8));
        List<String> names = new java.util.ArrayList<>();
        doc.fieldNames().forEachRemaining(names::add);
        assertEquals(List.of("start", "end"), names);
        assertEquals(json.readTree(log.get(0)), doc.get("start"), "the sidecar holds the start record");
        assertEquals(json.readTree(log.get(1)), doc.get("end"), "the sidecar holds the end record");
    }

    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void serviceDeliversStartAndEndToTheWebhookDespiteA500(@TempDir Path dir) throws Exception {
        List<String> bodies = new CopyOnWriteArrayList<>();
        AtomicInteger calls = new AtomicInteger();
        HttpServer server = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        server.createContext("/hook", ex -> {
            String body = new String(ex.getRequestBody().readAllBytes(), StandardCharsets.UTF_8);
            int status = calls.getAndIncrement() == 0 ? 500 : 200;
            if (status == 200) {
                bodies.add(body);
            }
            ex.sendResponseHeaders(status, -1);
            ex.close();
        });
        server.start();
        try {
            Path config = YardSite.config(dir, YardSite.clip().toString(),
                    "[[webhook]]", "url = \"http://127.0.0.1:" + server.getAddress().getPort() + "/hook\"", "max_backoff_seconds = 5");
            ProcessRunner.Result r = ProcessRunner.run(List.of("java", "-jar", ProcessRunner.jar().toString(),
                    "run", "--config", config.toString()), dir, 150);
            assertEquals(0, r.exitCode(), r.stderr());
            assertEquals(2, bodies.size(), "start and end delivered; stderr:\n" + r.stderr());
            bodies.forEach(SchemaCheck::assertEventRecord); // webhook bodies are the record of the shipped schema
            Map<String, Object> start = ReplayEndToEndTest.parse(bodies.get(0));
            Map<String, Object> end = ReplayEndToEndTest.parse(bodies.get(1));
            assertEquals("start", start.get("phase"));
            assertEquals("end", end.get("phase"));
            assertEquals(start.get("id"), end.get("id"));
            assertEquals(3, calls.get(), "one failed attempt, then start and end");
            List<String> log = Files.readAllLines(dir.resolve("data/events.jsonl"), StandardCharsets.UTF_8);
            assertEquals(bodies, log, "event log and webhook carry the same records");
            checkEvidence(dir.resolve("data"), start, end, log);
        } finally {
            server.stop(0);
        }
    }

    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void aStalledReceiverDoesNotHoldUpAnalysis(@TempDir Path dir) throws Exception {
        java.util.concurrent.CountDownLatch release = new java.util.concurrent.CountDownLatch(1);
        List<String> bodies = new CopyOnWriteArrayList<>();
        AtomicInteger calls = new AtomicInteger();
        HttpServer server = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        server.setExecutor(java.util.concurrent.Executors.newFixedThreadPool(2));
        server.createContext("/hook", ex -> {
            calls.incrementAndGet();
            String body = new String(ex.getRequestBody().readAllBytes(), StandardCharsets.UTF_8);
            try {
                release.await(); // the receiver hangs until the test lets it answer
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
            bodies.add(body);
            ex.sendResponseHeaders(200, -1);
            ex.close();
        });
        server.start();
        Process service = null;
        try {
            Path config = YardSite.config(dir, YardSite.clip().toString(), "[clips]", "enabled = false",
                    "[[webhook]]", "url = \"http://127.0.0.1:" + server.getAddress().getPort() + "/hook\"",
                    "timeout_seconds = 300");
            service = YardSite.startService(dir, config);
            Path log = dir.resolve("data/events.jsonl");
            // analysis goes on: the end phase is decided and logged while the first POST still hangs
            YardSite.awaitEvent(log, "wrong_way", "end", 1, 90);
            assertEquals(1, calls.get(), "one request, unanswered");
            assertEquals(0, bodies.size());
            release.countDown();
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
            while (bodies.size() < 2 && System.nanoTime() < deadline) {
                TimeUnit.MILLISECONDS.sleep(100); // polling for the deliveries, not a synchronisation sleep
            }
            assertEquals(Files.readAllLines(log, StandardCharsets.UTF_8), bodies, "both phases, in order");
        } finally {
            release.countDown();
            if (service != null) {
                service.destroyForcibly().waitFor();
            }
            server.stop(0);
        }
    }
}
