package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;

/**
 * {@code bench} on the demo clip with two cameras: a row per camera, every frame after the 5 s warm-up decoded
 * (the clip is 26 s at 15 fps, from its scene file), the analysis rate's share analysed, and stage costs that add up (the
 * ratio to decode is the sum of the stages over decode, so at least 1). Figures themselves are not asserted:
 * speed is measured, not tested.
 */
class BenchTest {
    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void twoCamerasGiveARowEachWithEveryFrameDecoded() {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int rc = Main.execute(new String[] {"bench", "--input", "test-streams/yard-lane.mp4", "--cameras", "2"},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(new ByteArrayOutputStream()));
        assertEquals(0, rc);
        List<String> lines = List.of(out.toString(StandardCharsets.UTF_8).split("\n"));
        assertEquals(4, lines.size(), lines.toString());
        for (String row : lines.subList(2, 4)) {
            String[] f = row.split(" \\| ");
            assertTrue(f[0].startsWith("bench-"), row);
            // after the 5 s warm-up: the clip's last 21 s at 15 fps decoded, 10 a second analysed
            assertEquals(315, Integer.parseInt(f[1]), 1, "every frame after the warm-up decoded: " + row);
            assertEquals(210, Integer.parseInt(f[2]), 1, "10 of every 15 frames analysed: " + row);
            double decode = Double.parseDouble(f[3]);
            double ratio = Double.parseDouble(f[8]);
            assertTrue(decode > 0 && ratio >= 1, row);
        }
        assertEquals(2, Main.execute(new String[] {"bench", "--input", "test-streams/yard-lane.mp4", "--cameras", "0"},
                new PrintStream(new ByteArrayOutputStream()), new PrintStream(new ByteArrayOutputStream())),
                "--cameras 0 is a usage error");
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void aLongerWarmUpCountsOnlyTheFramesAfterIt() {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int rc = Main.execute(new String[] {"bench", "--input", "test-streams/yard-lane.mp4", "--warm-up", "15"},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(new ByteArrayOutputStream()));
        assertEquals(0, rc);
        List<String> lines = List.of(out.toString(StandardCharsets.UTF_8).split("\n"));
        assertTrue(lines.get(0).contains("after the first 15 s of stream"), lines.get(0));
        String[] f = lines.get(2).split(" \\| ");
        // the clip's 26 s at 15 fps (ffprobe: 390 frames): 11 s after the warm-up, 10 a second analysed
        assertEquals(165, Integer.parseInt(f[1]), 1, lines.get(2));
        assertEquals(110, Integer.parseInt(f[2]), 1, lines.get(2));
        for (String bad : new String[] {"-1", "soon", "4000"}) {
            ByteArrayOutputStream err = new ByteArrayOutputStream();
            assertEquals(2, Main.execute(new String[] {"bench", "--input", "test-streams/yard-lane.mp4", "--warm-up",
                bad}, new PrintStream(new ByteArrayOutputStream()), new PrintStream(err, true, StandardCharsets.UTF_8)));
            assertEquals("wayward bench: --warm-up " + bad + " (expected seconds from 0 to 3600)",
                    err.toString(StandardCharsets.UTF_8).strip());
        }
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        assertEquals(66, Main.execute(new String[] {"bench", "--input", "test-streams/yard-lane.mp4", "--warm-up",
            "30"}, new PrintStream(new ByteArrayOutputStream()), new PrintStream(err, true, StandardCharsets.UTF_8)));
        assertTrue(err.toString(StandardCharsets.UTF_8).contains("too short to measure (the first 30 s are warm-up"),
                err.toString(StandardCharsets.UTF_8));
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void withAnAnalysisInputTheMainInputIsOnlyDemuxed(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir)
            throws Exception {
        // the demo clip scaled to 1280x720 by Debian's ffmpeg: the same 390 frames, so the same 26 s
        java.nio.file.Path main = dir.resolve("main.mp4");
        YardSite.command("ffmpeg", "-v", "error", "-i", "test-streams/yard-lane.mp4", "-vf", "scale=1280:720", "-c:v",
                "libx264", "-preset", "ultrafast", "-bf", "0", "-g", "30", main.toString());
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int rc = Main.execute(new String[] {"bench", "--input", main.toString(), "--analysis-input",
            "test-streams/yard-lane.mp4"}, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(new ByteArrayOutputStream()));
        assertEquals(0, rc);
        List<String> lines = List.of(out.toString(StandardCharsets.UTF_8).split("\n"));
        assertEquals(3, lines.size(), lines.toString());
        assertTrue(lines.get(1).contains("| main packets | main demux ms/packet |"), lines.get(1));
        String[] f = lines.get(2).split(" \\| ");
        // the analysis decoded the 640x360 clip (every frame after the warm-up), the main file's packets after
        // the warm-up were read, not decoded (ffprobe: 390 packets, 15 per second, so 315 after 5 s)
        assertEquals(315, Integer.parseInt(f[1]), 1, lines.get(2));
        assertEquals(210, Integer.parseInt(f[2]), 1, lines.get(2));
        assertEquals(315, Integer.parseInt(f[7]), 1, lines.get(2));
        assertTrue(Double.parseDouble(f[8]) > 0, lines.get(2));
        assertEquals(66, Main.execute(new String[] {"bench", "--input", main.toString(), "--analysis-input",
            dir.resolve("missing.mp4").toString()}, new PrintStream(new ByteArrayOutputStream()),
                new PrintStream(new ByteArrayOutputStream())), "a missing --analysis-input is a missing input");
    }
}
