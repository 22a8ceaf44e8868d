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
 * Real footage of foliage in the wind: Debian's opencv-doc sample tree.avi (a leafy tree filmed through a window,
 * 320×240 Cinepak at 15 fps, 29.6 s; /usr/share/doc/opencv-doc/examples/data/tree.avi). Its leaves and twigs
 * flutter all the time; a hand comes in from the top right at about 22.5 s (seen by eye on frames taken at 2 a
 * second: absent at 22.0 s, its fingertips in at 22.5 s) and moves down and across the picture. With one zone over
 * the whole tree and any of four headings, the fluttering must start no wrong-way event, and the hand, moving down,
 * must start one in a zone whose permitted way is up: swaying leaves are not movers, a hand is.
 */
class SwayingTreeIT {
    /** Debian's opencv-doc package. */
    static final Path TREE = Path.of("/usr/share/doc/opencv-doc/examples/data/tree.avi");
    /** The last stream second before the hand: until then only leaves move. */
    static final double LEAVES_ONLY_UNTIL_S = 22.0;

    @Test
    @Timeout(value = 3, unit = TimeUnit.MINUTES)
    void flutteringLeavesStartNothingAndTheHandStartsAnEvent(@TempDir Path dir) throws Exception {
        // .ci/run installs opencv-doc: a missing clip is a failure, not a skip
        assertTrue(Files.isRegularFile(TREE), TREE + " not found (apt-get install opencv-doc)");
        for (int heading : new int[] {0, 90, 180, 270}) {
            List<Double> starts = wrongWayStarts(dir, heading);
            for (double s : starts) {
                assertTrue(s > LEAVES_ONLY_UNTIL_S, "heading " + heading + ": a start at " + s
                        + " s, while only leaves move: " + starts);
            }
            if (heading == 0) {
                // up permitted: the hand coming down into the picture goes against it
                assertEquals(1, starts.size(), "heading 0: the hand coming down is one wrong-way passage: " + starts);
            }
        }
    }

    /** Replays tree.avi with one zone over the tree and the given heading; returns the wrong-way starts' times. */
    private static List<Double> wrongWayStarts(Path dir, int heading) throws Exception {
        Path config = dir.resolve("tree-" + heading + ".toml");
        Files.writeString(config, String.join("\n",
                "[service]",
                "data_dir = \"" + dir.resolve("data-" + heading).toString().replace("\\", "/") + "\"",
                "http = \"off\"",
                "[[camera]]",
                "id = \"window\"",
                "source = \"" + TREE + "\"",
                "[[camera.zone]]",
                "id = \"tree\"",
                // the whole tree, leaving out the window frame on the left
                "polygon = [[0.10, 0.05], [0.95, 0.05], [0.95, 0.98], [0.10, 0.98]]",
                "heading_deg = " + heading,
                "tolerance_deg = 60",
                ""));
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code = Main.execute(new String[] {"replay", "--config", config.toString(), "--input", TREE.toString()},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(0, code, err.toString(StandardCharsets.UTF_8));
        List<Double> starts = new ArrayList<>();
        for (String line : out.toString(StandardCharsets.UTF_8).split("\n")) {
            if (!line.isBlank()) {
                Map<String, Object> e = ReplayEndToEndTest.parse(line);
                if ("wrong_way".equals(e.get("kind")) && "start".equals(e.get("phase"))) {
                    starts.add(((Number) e.get("stream_s")).doubleValue());
                }
            }
        }
        return starts;
    }
}
