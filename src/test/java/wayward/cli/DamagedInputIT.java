package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
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
 * Inputs that real recorders produce: a transport stream whose timestamps jump (two recordings concatenated,
 * the second 500 s later; made with Debian's ffmpeg), a truncated transport stream, and an MP4 cut short
 * before its index. No crash; what can be analysed is; what cannot gives one clear line and exit 66.
 */
class DamagedInputIT {
    private final ByteArrayOutputStream out = new ByteArrayOutputStream();
    private final ByteArrayOutputStream err = new ByteArrayOutputStream();

    private int replay(Path input) {
        return Main.execute(new String[] {"replay", "--config", "conf/demo.toml", "--input", input.toString()},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
    }

    private List<Map<String, Object>> starts() throws Exception {
        List<Map<String, Object>> s = new ArrayList<>();
        for (String line : out.toString(StandardCharsets.UTF_8).split("\n")) {
            if (!line.isBlank()) {
                Map<String, Object> e = ReplayEndToEndTest.parse(line);
                if ("start".equals(e.get("phase"))) {
                    s.add(e);
                }
            }
        }
        return s;
    }

    private static void ffmpeg(String... args) throws Exception {
        List<String> cmd = new ArrayList<>(List.of("ffmpeg", "-v", "error", "-y"));
        cmd.addAll(List.of(args));
        Process p = new ProcessBuilder(cmd).redirectErrorStream(true).start();
        String o = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertEquals(0, p.waitFor(), o);
    }

    private static Path jumpingStream(Path dir) throws Exception {
        Path clip = ProcessRunner.projectDir().resolve("test-streams/yard-lane.mp4");
        Path a = dir.resolve("a.ts");
        Path b = dir.resolve("b.ts");
        ffmpeg("-i", clip.toString(), "-c", "copy", "-f", "mpegts", a.toString());
        ffmpeg("-i", clip.toString(), "-c", "copy", "-output_ts_offset", "500", "-f", "mpegts", b.toString());
        Path jump = dir.resolve("jump.ts");
        Files.write(jump, Files.readAllBytes(a));
        Files.write(jump, Files.readAllBytes(b), java.nio.file.StandardOpenOption.APPEND);
        return jump;
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void timestampJumpIsSplicedAndBothPassesAreAnalysed(@TempDir Path dir) throws Exception {
        assertEquals(0, replay(jumpingStream(dir)), err.toString(StandardCharsets.UTF_8));
        List<Map<String, Object>> s = starts();
        assertEquals(2, s.size(), "the truck in each of the two recordings: " + out);
        double first = (Double) s.get(0).get("stream_s");
        double second = (Double) s.get(1).get("stream_s");
        // stream time runs on across the jump: the second pass starts about 26 s later, not 500 s
        assertEquals(26, second - first, 1.0, "stream time spliced at the jump");
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void truncatedTransportStreamIsAnalysedAsFarAsItGoes(@TempDir Path dir) throws Exception {
        byte[] all = Files.readAllBytes(jumpingStream(dir));
        Path cut = dir.resolve("cut.ts");
        Files.write(cut, java.util.Arrays.copyOf(all, (int) (all.length * 0.3))); // ends mid-packet, mid-first-pass
        assertEquals(0, replay(cut), err.toString(StandardCharsets.UTF_8));
        assertTrue(starts().size() <= 1, out.toString(StandardCharsets.UTF_8));
    }

    @Test
    @Timeout(value = 60, unit = TimeUnit.SECONDS)
    void mp4CutBeforeItsIndexGivesOneClearLine(@TempDir Path dir) throws Exception {
        byte[] all = Files.readAllBytes(ProcessRunner.projectDir().resolve("test-streams/yard-lane.mp4"));
        Path cut = dir.resolve("cut.mp4");
        Files.write(cut, java.util.Arrays.copyOf(all, all.length / 2));
        assertEquals(66, replay(cut));
        String e = err.toString(StandardCharsets.UTF_8).trim();
        assertTrue(e.startsWith("wayward replay: --input " + cut + ": cannot read it as video ("), e);
        assertEquals(1, e.lines().count(), "one line: " + e);
    }
}
