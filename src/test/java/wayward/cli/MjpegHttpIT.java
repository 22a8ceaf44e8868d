package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertTrue;

import com.sun.net.httpserver.HttpServer;
import java.io.OutputStream;
import java.net.InetSocketAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * A camera that serves MJPEG over HTTP (multipart/x-mixed-replace, common practice for such cameras): the JDK's
 * HTTP server plays the demo clip's frames (turned into JPEGs by Debian's ffmpeg) at 15 frames per second. Such
 * streams carry no timestamps, so the service times them by the wall clock; the wrong-way truck is still seen
 * about 12 s into the clip.
 */
class MjpegHttpIT {
    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void wrongWayIsSeenOnAnMjpegCamera(@TempDir Path dir) throws Exception {
        Path frames = Files.createDirectories(dir.resolve("frames"));
        Process ff = new ProcessBuilder("ffmpeg", "-v", "error", "-i",
                ProcessRunner.projectDir().resolve("test-streams/yard-lane.mp4").toString(), "-q:v", "5",
                frames.resolve("f%04d.jpg").toString()).redirectErrorStream(true).start();
        String ffOut = new String(ff.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertTrue(ff.waitFor() == 0, ffOut);
        List<byte[]> jpegs;
        try (Stream<Path> s = Files.list(frames)) {
            jpegs = s.sorted().map(p -> {
                try {
                    return Files.readAllBytes(p);
                } catch (java.io.IOException e) {
                    throw new java.io.UncheckedIOException(e);
                }
            }).toList();
        }
        HttpServer server = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        server.setExecutor(java.util.concurrent.Executors.newCachedThreadPool());
        server.createContext("/stream.mjpg", ex -> {
            ex.getResponseHeaders().set("Content-Type", "multipart/x-mixed-replace;boundary=wwframe");
            ex.sendResponseHeaders(200, 0);
            try (OutputStream out = ex.getResponseBody()) {
                long start = System.nanoTime();
                for (int i = 0; ; i++) {
                    byte[] jpg = jpegs.get(i % jpegs.size());
                    out.write(("--wwframe\r\nContent-Type: image/jpeg\r\nContent-Length: " + jpg.length + "\r\n\r\n")
                            .getBytes(StandardCharsets.US_ASCII));
                    out.write(jpg);
                    out.write("\r\n".getBytes(StandardCharsets.US_ASCII));
                    out.flush();
                    // the camera's own frame clock: 15 frames per second
                    long due = start + (i + 1) * 1_000_000_000L / 15;
                    long wait = due - System.nanoTime();
                    if (wait > 0) {
                        TimeUnit.NANOSECONDS.sleep(wait);
                    }
                }
            } catch (java.io.IOException | InterruptedException gone) {
                // the client went away
            }
        });
        server.start();
        Path config = YardSite.config(dir, "http://127.0.0.1:" + server.getAddress().getPort() + "/stream.mjpg");
        Path log = dir.resolve("data/events.jsonl");
        Process service = YardSite.startService(dir, config);
        try {
            Map<String, Object> start = YardSite.awaitRecord(log, "wrong_way", "start", 1, 60);
            assertTrue(start != null, "no wrong_way start; service log:\n" + Files.readString(dir.resolve("service.log")));
            // ground truth: the truck enters the zone 11.95 s into the clip (test-streams/yard-lane.truth.json);
            // wall-clock timing of an untimed stream adds the connection's start-up
            double s = (Double) start.get("stream_s");
            assertTrue(s > 11 && s < 15, "start at stream " + s + " s");
        } finally {
            service.destroy();
            service.waitFor(30, TimeUnit.SECONDS);
            server.stop(0);
        }
    }
}
