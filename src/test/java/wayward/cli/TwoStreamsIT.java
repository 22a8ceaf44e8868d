package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * A camera with two streams ({@code analysis_source}) on the packaged jar: the demo lane's clip (640×360) as the
 * analysis stream and the same clip scaled to 1280×720 by Debian's ffmpeg (libx264, a keyframe every 2 s, no
 * B-frames) as the main stream. Checked against ffprobe/ffmpeg (the clip's size and its frames against the main
 * file's own), the event schema, and the status API's counters; then the main stream unreachable (RTSP to a closed
 * loopback port) while GStreamer's RTSP server (Debian's gir1.2-gst-rtsp-server-1.0) serves the analysis stream,
 * and a main stream whose server appears later: it comes back on its own and clips are full size again.
 */
class TwoStreamsIT {
    private static final ObjectMapper JSON = new ObjectMapper();
    /** Frame rate of the demo clip (ffprobe: r_frame_rate 15/1). */
    private static final int FPS = 15;
    /** [clips] defaults: 3 s pre-roll, 4 s post-roll (ClipConfig.DEFAULTS, README). */
    private static final double PRE_ROLL_S = 3;
    private static final double POST_ROLL_S = 4;

    private static Path config(Path dir, String source, String analysisSource, String http) throws IOException {
        Path f = dir.resolve("site.toml");
        Files.writeString(f, String.join("\n", "[service]", "data_dir = \"data\"", "http = \"" + http + "\"",
                "[[camera]]", "id = \"yard-mast-2\"", "source = \"" + source + "\"",
                "analysis_source = \"" + analysisSource + "\"", "[[camera.zone]]", "id = \"lane-2-out\"",
                "polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]", "heading_deg = 0", ""));
        return f;
    }

    private static String get(String url) throws Exception {
        HttpResponse<String> r = HttpClient.newHttpClient().send(HttpRequest.newBuilder(URI.create(url)).build(),
                HttpResponse.BodyHandlers.ofString());
        assertEquals(200, r.statusCode(), url);
        return r.body();
    }

    /** Each decoded frame's MD5 (ffmpeg's framemd5 muxer), in order. */
    private static List<String> frameHashes(Path video) throws Exception {
        List<String> out = new ArrayList<>();
        for (String line : YardSite.command("ffmpeg", "-v", "error", "-i", video.toString(), "-f", "framemd5", "-")
                .split("\n")) {
            if (!line.startsWith("#")) {
                String[] parts = line.split(",");
                out.add(parts[parts.length - 1].trim());
            }
        }
        return out;
    }

    /** SIGTERM, so open clips end with their trailer; killed if it has not ended within 30 s. */
    private static void stop(Process service) throws InterruptedException {
        service.destroy();
        if (!service.waitFor(30, TimeUnit.SECONDS)) {
            service.destroyForcibly();
        }
    }

    @Test
    @Timeout(value = 300, unit = TimeUnit.SECONDS)
    void analysesTheSubStreamAndCopiesFullSizeClipsFromTheMainStream(@TempDir Path dir) throws Exception {
        Path sub = YardSite.clip();
        Path main = dir.resolve("main.mp4");
        YardSite.command("ffmpeg", "-v", "error", "-i", sub.toString(), "-vf", "scale=1280:720", "-c:v", "libx264",
                "-preset", "veryfast", "-bf", "0", "-g", "30", "-pix_fmt", "yuv420p", main.toString());
        int port = RtspClipServer.freePort();
        Path log = dir.resolve("data/events.jsonl");
        Process service = YardSite.startService(dir, config(dir, main.toString(), sub.toString(), "127.0.0.1:" + port));
        JsonNode streams;
        String metrics;
        try {
            Map<String, Object> start = YardSite.awaitRecord(log, "wrong_way", "start", 1, 90);
            // the status while it runs: both streams, the main one only demuxed (its decoder never ran)
            streams = JSON.readTree(get("http://127.0.0.1:" + port + "/api/cameras")).get("cameras").get(0)
                    .get("streams");
            metrics = get("http://127.0.0.1:" + port + "/metrics");
            assertEquals("source", start.get("evidence_stream"));
            assertTrue(service.waitFor(90, TimeUnit.SECONDS), "the service ends with its files");
        } catch (AssertionError e) {
            System.out.println(Files.readString(dir.resolve("service.log")));
            throw e;
        } finally {
            stop(service);
        }
        assertEquals("source", streams.get(0).get("stream").asText());
        assertEquals(false, streams.get(0).get("decoded").asBoolean());
        assertEquals(1280, streams.get(0).get("width").asInt());
        assertEquals(0, streams.get(0).get("frames_in").asLong(), "main stream frames decoded");
        assertTrue(streams.get(0).get("packets_in").asLong() > 100, streams.toString());
        assertEquals("analysis_source", streams.get(1).get("stream").asText());
        assertEquals(true, streams.get(1).get("decoded").asBoolean());
        assertEquals(640, streams.get(1).get("width").asInt());
        assertTrue(streams.get(1).get("frames_in").asLong() > 100, streams.toString());
        assertTrue(metrics.contains("wayward_stream_frames_decoded_total{camera=\"yard-mast-2\",stream=\"source\"} 0\n"),
                metrics);
        assertTrue(metrics.contains("wayward_stream_width_pixels{camera=\"yard-mast-2\",stream=\"analysis_source\"} 640\n"),
                metrics);
        // promtool (Prometheus, Debian) parses the exposition format and lints the per-stream families
        Path m = dir.resolve("metrics.txt");
        Files.writeString(m, metrics);
        assertEquals("", YardSite.command("sh", "-c", "promtool check metrics < " + m), "promtool found nothing to say");

        List<Map<String, Object>> events = YardSite.events(log); // each held to the event schema
        Map<String, Object> start = events.stream().filter(e -> "wrong_way".equals(e.get("kind"))
                && "start".equals(e.get("phase"))).findFirst().orElseThrow();
        Map<String, Object> end = events.stream().filter(e -> "wrong_way".equals(e.get("kind"))
                && "end".equals(e.get("phase"))).findFirst().orElseThrow();
        assertEquals("source", end.get("evidence_stream"));
        assertTrue(events.stream().noneMatch(e -> "camera_lost".equals(e.get("kind"))), events.toString());
        Path clip = dir.resolve("data").resolve((String) start.get("clip"));
        // full size: the main stream's packets, copied (ffprobe, Debian)
        assertEquals("1280,720", YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-show_entries",
                "stream=width,height", "-of", "csv=p=0", clip.toString()));
        // its frames are the main file's own from the keyframe at or before trigger − pre-roll (keyframes every 2 s)
        // to end + post-roll: the time mapping placed the main packets on the analysis axis (both files start at 0)
        List<String> mainFrames = frameHashes(main);
        List<String> clipFrames = frameHashes(clip);
        int firstIndex = (int) (Math.floor(((Double) start.get("stream_s") - PRE_ROLL_S) / 2) * 2 * FPS);
        assertEquals(mainFrames.get(firstIndex), clipFrames.get(0), "first frame: main frame " + firstIndex);
        assertEquals(mainFrames.subList(firstIndex, firstIndex + clipFrames.size()), clipFrames);
        int lastIndex = firstIndex + clipFrames.size() - 1;
        double expectedLast = ((Double) end.get("stream_s") + POST_ROLL_S) * FPS;
        // the mapping may be off by a frame or two (DEVELOPERS.md, "Two streams"); a clip cut by the wrong second
        // would be off by 15 frames
        assertTrue(Math.abs(lastIndex - expectedLast) <= 2, "last frame " + lastIndex + ", expected about "
                + expectedLast);
    }

    @Test
    @Timeout(value = 300, unit = TimeUnit.SECONDS)
    void theMainStreamComesBackOnItsOwnAndClipsAreFullSizeAgain(@TempDir Path dir) throws Exception {
        Path main = dir.resolve("main.mp4");
        YardSite.command("ffmpeg", "-v", "error", "-i", YardSite.clip().toString(), "-vf", "scale=1280:720", "-c:v",
                "libx264", "-preset", "veryfast", "-bf", "0", "-g", "30", "-pix_fmt", "yuv420p", main.toString());
        // the analysis stream's server may take any port: a port taken between picking and binding is picked again
        RtspClipServer.Started subServer = RtspClipServer.startOnFreePort(YardSite.clip());
        int subPort = subServer.port();
        int mainPort = RtspClipServer.freePort();
        Process sub = subServer.process();
        Process mainServer = null;
        Path log = dir.resolve("data/events.jsonl");
        Process service = YardSite.startService(dir, config(dir, "rtsp://127.0.0.1:" + mainPort + "/clip",
                "rtsp://127.0.0.1:" + subPort + "/clip", "off"));
        Map<String, Object> lost;
        Map<String, Object> back;
        Map<String, Object> wrongWay = null;
        try {
            // the main stream's server is not there yet: it is lost, the analysis stream is watched
            lost = YardSite.awaitRecord(log, "camera_lost", "start", 1, 60);
            mainServer = RtspClipServer.startOn(mainPort, main);
            back = YardSite.awaitRecord(log, "camera_lost", "end", 1, 90);
            // the demo lane loops every 26 s on the analysis server: wrong-way starts keep coming; take the first
            // that started after the main stream was back
            for (int n = 1; n <= 4 && wrongWay == null; n++) {
                Map<String, Object> e = YardSite.awaitRecord(log, "wrong_way", "start", n, 90);
                if (java.time.Instant.parse((String) e.get("at")).isAfter(java.time.Instant.parse((String) back.get("at"))
                        .plusSeconds(5))) {
                    wrongWay = e;
                }
            }
            assertTrue(wrongWay != null, "a wrong-way start after the main stream came back");
            YardSite.awaitEvent(log, "wrong_way", "end", YardSite.events(log).stream().filter(e ->
                    "wrong_way".equals(e.get("kind")) && "start".equals(e.get("phase"))).toList().size(), 60);
        } catch (AssertionError e) {
            System.out.println(Files.readString(dir.resolve("service.log")));
            throw e;
        } finally {
            stop(service);
            sub.destroyForcibly();
            if (mainServer != null) {
                mainServer.destroyForcibly();
            }
        }
        assertEquals("source", lost.get("stream"));
        assertEquals("source", back.get("stream"));
        assertEquals(lost.get("id"), back.get("id"), "one outage, one id");
        assertEquals("source", wrongWay.get("evidence_stream"));
        Path clip = dir.resolve("data").resolve((String) wrongWay.get("clip"));
        // full size again
        assertCleanClip(clip, "1280,720");
    }

    @Test
    @Timeout(value = 300, unit = TimeUnit.SECONDS)
    void alertsWithClipsFromTheAnalysisStreamWhileTheMainStreamIsDown(@TempDir Path dir) throws Exception {
        RtspClipServer.Started started = RtspClipServer.startOnFreePort(YardSite.clip());
        int rtsp = started.port();
        int closed = RtspClipServer.freePort(); // nothing listens there: connection refused
        Process server = started.process();
        Path log = dir.resolve("data/events.jsonl");
        Process service = YardSite.startService(dir, config(dir, "rtsp://127.0.0.1:" + closed + "/main",
                "rtsp://127.0.0.1:" + rtsp + "/clip", "off"));
        Map<String, Object> lost;
        Map<String, Object> start;
        try {
            lost = YardSite.awaitRecord(log, "camera_lost", "start", 1, 60);
            start = YardSite.awaitRecord(log, "wrong_way", "start", 1, 90);
            YardSite.awaitRecord(log, "wrong_way", "end", 1, 60);
        } catch (AssertionError e) {
            System.out.println(Files.readString(dir.resolve("service.log")));
            throw e;
        } finally {
            stop(service);
            server.destroyForcibly();
        }
        assertEquals("source", lost.get("stream"), "the main stream dropped, not the analysed one");
        assertEquals("analysis_source", start.get("evidence_stream"));
        List<Map<String, Object>> events = YardSite.events(log); // each held to the event schema
        assertTrue(events.stream().noneMatch(e -> "camera_lost".equals(e.get("kind"))
                && "analysis_source".equals(e.get("stream"))), events.toString());
        Path clip = dir.resolve("data").resolve((String) start.get("clip"));
        // the analysis stream's own size, copied
        assertCleanClip(clip, "640,360");
    }

    /** The clip has the given size ("w,h"), starts at a keyframe and decodes cleanly (ffprobe and ffmpeg, Debian). */
    private static void assertCleanClip(Path clip, String size) throws Exception {
        assertEquals(size, YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-show_entries",
                "stream=width,height", "-of", "csv=p=0", clip.toString()));
        String first = YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-read_intervals", "%+#1",
                "-show_entries", "packet=pts_time,flags", "-of", "csv=p=0", clip.toString());
        assertTrue(first.startsWith("0.000000,K"), clip + ": " + first);
        assertEquals("", YardSite.command("ffmpeg", "-v", "error", "-i", clip.toString(), "-f", "null", "-"));
    }
}
