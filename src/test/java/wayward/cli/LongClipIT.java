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
        try (Stream<Path> s = Files.list(dir.resolve("data/clips/yard-mast-2"))) {
            parts = s.filter(p -> p.toString().endsWith(".mp4")).sorted().toList();
        }
        // the uncut clip would run from the keyframe at 8 s to 20.87 s (RunWebhookIT): 193 frames at 15 fps, and
        // with keyframes every 2 s a 5 s cap cuts it at 14 s and 20 s
        assertEquals(3, parts.size(), parts.toString());
        int frames = 0;
        for (Path p : parts) {
            String first = YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-read_intervals", "%+#1",
                    "-show_entries", "packet=pts_time,flags", "-of", "csv=p=0", p.toString());
            assertTrue(first.startsWith("0.000000,K"), p + ": " + first);
            frames += Integer.parseInt(YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-count_packets",
                    "-show_entries", "stream=nb_read_packets", "-of", "csv=p=0", p.toString()));
            assertEquals("", YardSite.command("ffmpeg", "-v", "error", "-i", p.toString(), "-f", "null", "-"), p + " decodes cleanly");
        }
        assertEquals(193, frames, 1, "the parts together hold the uncut clip's frames");
        assertTrue(parts.stream().anyMatch(p -> p.getFileName().toString().endsWith("-part2.mp4"))
                && parts.stream().anyMatch(p -> p.getFileName().toString().endsWith("-part3.mp4")), parts.toString());
    }
}
