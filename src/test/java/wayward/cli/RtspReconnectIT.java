package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * The service on a real RTSP server on loopback — GStreamer's RTSP server (Debian's gir1.2-gst-rtsp-server-1.0
 * through python3-gi) serving the demo clip — that is killed mid-stream and restarted, twice: each time a
 * camera_lost start, then its end (the camera watched again), then analysis goes on (the wrong-way truck is seen
 * again), and the service's thread count does not grow.
 */
class RtspReconnectIT {
    private Process server;

    private Process startServer(int port) throws IOException {
        // the same port again after each kill: the camera's URL does not change
        return RtspClipServer.startOn(port, ProcessRunner.projectDir().resolve("test-streams/yard-lane.mp4"));
    }

    private static int threads(long pid) throws IOException {
        return (int) status(pid, "Threads:");
    }

    /** A number from /proc/PID/status (Linux), e.g. "Threads:" or "VmRSS:" (kB). */
    private static long status(long pid, String field) throws IOException {
        for (String line : Files.readAllLines(Path.of("/proc/" + pid + "/status"))) {
            if (line.startsWith(field)) {
                return Long.parseLong(line.substring(field.length()).trim().split("\\s+")[0]);
            }
        }
        return -1;
    }

    @Test
    @Timeout(value = 480, unit = TimeUnit.SECONDS)
    void survivesServerRestartsWithLostAndBackEvents(@TempDir Path dir) throws Exception {
        int port = RtspClipServer.freePort();
        server = startServer(port);
        Path config = YardSite.config(dir, "rtsp://127.0.0.1:" + port + "/clip");
        Path log = dir.resolve("data/events.jsonl");
        Process service = YardSite.startService(dir, config);
        try {
            // ground truth of the clip: the wrong-way truck's start comes about 12.3 s into each pass
            YardSite.awaitEvent(log, "wrong_way", "start", 1, 60);
            int threadsBefore = threads(service.pid());
            long rssBefore = status(service.pid(), "VmRSS:");
            for (int cycle = 1; cycle <= 2; cycle++) {
                server.destroyForcibly().waitFor();
                int lostAt = YardSite.awaitEvent(log, "camera_lost", "start", cycle, 30);
                server = startServer(port);
                // up to 120 s: on a loaded 2-core machine the restarted GStreamer server and the capture's backoff
                // (1, 2, 4 … s) once took longer than 60 s in a full CI run; the event itself is still required
                int backAt = YardSite.awaitEvent(log, "camera_lost", "end", cycle, 120);
                assertTrue(backAt > lostAt);
                assertEquals(YardSite.events(log).get(lostAt).get("id"), YardSite.events(log).get(backAt).get("id"), "one outage, one id");
                int wrongWay = YardSite.awaitEvent(log, "wrong_way", "start", cycle + 1, 60);
                assertTrue(wrongWay > backAt, "analysis resumed after the camera came back");
            }
            int threadsAfter = threads(service.pid());
            assertTrue(Math.abs(threadsAfter - threadsBefore) <= 2,
                    "threads before " + threadsBefore + ", after two restarts " + threadsAfter);
            long rssAfter = status(service.pid(), "VmRSS:");
            // a leaked decoder or packet ring per reconnect would be tens of MB (CAPTURE-NOTES); allow JIT and heap
            // settling
            assertTrue(rssAfter - rssBefore < 60_000, "resident memory grew from " + rssBefore + " kB to " + rssAfter
                    + " kB over two restarts");
        } catch (AssertionError e) {
            // the service's own account of what happened, for the report
            System.out.println(Files.readString(dir.resolve("service.log")));
            throw e;
        } finally {
            service.destroy(); // SIGTERM: orderly shutdown
            if (!service.waitFor(30, TimeUnit.SECONDS)) {
                service.destroyForcibly();
            }
            server.destroyForcibly();
        }
        assertTrue(Files.readString(dir.resolve("service.log")).contains("stopped"), "orderly shutdown logged");
        // every wrong-way event's clip is playable, cut short or not by the server's death: a keyframe at pts 0,
        // the pre-roll in it, and a clean decode (ffprobe and ffmpeg, Debian)
        int clips = 0;
        for (java.util.Map<String, Object> e : YardSite.events(log)) {
            if ("wrong_way".equals(e.get("kind")) && "start".equals(e.get("phase"))) {
                Path clip = dir.resolve("data").resolve((String) e.get("clip"));
                String first = YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-read_intervals",
                        "%+#1", "-show_entries", "packet=pts_time,flags", "-of", "csv=p=0", clip.toString());
                assertTrue(first.startsWith("0.000000,K"), clip + ": " + first);
                double duration = Double.parseDouble(YardSite.command("ffprobe", "-v", "error", "-show_entries",
                        "format=duration", "-of", "csv=p=0", clip.toString()));
                assertTrue(duration >= 3, clip + ": " + duration + " s, less than the 3 s pre-roll");
                assertEquals("", YardSite.command("ffmpeg", "-v", "error", "-i", clip.toString(), "-f", "null", "-"));
                clips++;
            }
        }
        assertEquals(3, clips, "one clip per wrong-way event");
    }
}
