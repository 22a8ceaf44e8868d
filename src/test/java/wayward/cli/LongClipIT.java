package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * An event longer than the clip cap: the clip goes on in further parts, each cut at a keyframe and each a valid
 * MP4 on its own (ffprobe, Debian's ffmpeg), together exactly the frames of one uncut clip.
 */
class LongClipIT {
    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void longEventClipContinuesInPartsCutAtKeyframes(@TempDir Path dir) throws Exception {
        Path config = YardSite.config(dir, YardSite.clip().toString(), "[clips]", "max_seconds = 5");
        ProcessRunner.Result r = ProcessRunner.run(List.of("java", "-jar", ProcessRunner.jar().toString(), "run",
                "--config", config.toString()), dir, 150);
        assertEquals(0, r.exitCode(), r.stderr());
        List<Path> parts;
        try (Stream<Path> s = Files.list(dir.resolve("data/evidence/yard-mast-2"))) {
            parts = s.filter(p -> p.toString().endsWith(".mp4")).sorted().toList();
        }
        // the uncut clip runs from the keyframe at or before start − 3 s pre-roll (keyframes every 2 s in the demo
        // clip, test-streams/yard-lane.scene.toml) to end + 4 s post-roll or the clip's end; a 5 s cap cuts it at
        // the first keyframe 5 s or more into each part
        List<java.util.Map<String, Object>> events = YardSite.events(dir.resolve("data/events.jsonl"));
        double start = Double.NaN;
        double end = Double.NaN;
        for (java.util.Map<String, Object> e : events) {
            if ("wrong_way".equals(e.get("kind"))) {
                if ("start".equals(e.get("phase")) && Double.isNaN(start)) {
                    start = (Double) e.get("stream_s");
                } else if ("end".equals(e.get("phase")) && Double.isNaN(end)) {
                    end = (Double) e.get("stream_s");
                }
            }
        }
        assertTrue(!Double.isNaN(start) && !Double.isNaN(end), "one wrong-way event: " + events);
        double videoSeconds = Double.parseDouble(YardSite.command("ffprobe", "-v", "error", "-show_entries",
                "format=duration", "-of", "csv=p=0", YardSite.clip().toString()).trim());
        double from = Math.floor((start - 3) / 2) * 2;
        double to = Math.min(end + 4, videoSeconds);
        int expectedFrames = (int) Math.round((to - from) * 15);
        int expectedParts = 1;
        for (double cut = from; ; expectedParts++) {
            cut = Math.ceil((cut + 5) / 2) * 2;
            if (cut >= to - 1e-6) {
                break;
            }
        }
        assertTrue(expectedParts >= 2, "the event outlasts the 5 s cap: " + from + " to " + to);
        assertEquals(expectedParts, parts.size(), parts.toString());
        int frames = 0;
        for (Path p : parts) {
            String first = YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-read_intervals", "%+#1",
                    "-show_entries", "packet=pts_time,flags", "-of", "csv=p=0", p.toString());
            assertTrue(first.startsWith("0.000000,K"), p + ": " + first);
            frames += Integer.parseInt(YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-count_packets",
                    "-show_entries", "stream=nb_read_packets", "-of", "csv=p=0", p.toString()));
            assertEquals("", YardSite.command("ffmpeg", "-v", "error", "-i", p.toString(), "-f", "null", "-"), p + " decodes cleanly");
        }
        assertEquals(expectedFrames, frames, 2, "the parts together hold the uncut clip's frames");
        assertTrue(parts.stream().anyMatch(p -> p.getFileName().toString().endsWith("-part2.mp4")), parts.toString());
    }
}
