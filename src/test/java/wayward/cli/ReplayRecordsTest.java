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
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import wayward.scene.Scene;
import wayward.scene.SceneGenerator;
import wayward.testing.SchemaCheck;

/**
 * Every record {@code replay} writes — on standard output and in the report's events.jsonl — fits the shipped event
 * schema (networknt's validator, {@link SchemaCheck}): the demo, a zone without heading on the demo clip (motion),
 * and the suite scenes that raise each tamper kind. Each run must raise the kind it is chosen for, so the check
 * sees that kind's record.
 */
class ReplayRecordsTest {
    private static List<String> replay(Path config, Path video, Path report) throws Exception {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code = Main.execute(new String[] {"replay", "--config", config.toString(), "--input", video.toString(),
                "--report", report.toString()}, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(0, code, err.toString(StandardCharsets.UTF_8));
        List<String> lines = new ArrayList<>();
        for (String line : out.toString(StandardCharsets.UTF_8).split("\n")) {
            if (!line.isBlank()) {
                SchemaCheck.assertEventRecord(line);
                lines.add(line);
            }
        }
        List<String> reported = Files.readAllLines(report.resolve("events.jsonl"), StandardCharsets.UTF_8);
        reported.forEach(SchemaCheck::assertEventRecord);
        assertEquals(lines, reported, "the report holds the same records");
        return lines;
    }

    private static boolean has(List<String> lines, String kind) {
        return lines.stream().anyMatch(l -> l.contains("\"kind\":\"" + kind + "\",\"phase\":\"start\""))
                && lines.stream().anyMatch(l -> l.contains("\"kind\":\"" + kind + "\",\"phase\":\"end\""));
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void theDemoAndAMotionZoneWriteRecordsThatFitTheSchema(@TempDir Path dir) throws Exception {
        Path clip = YardSite.clip();
        List<String> demo = replay(ProcessRunner.projectDir().resolve("conf/demo.toml"), clip, dir.resolve("demo"));
        assertTrue(has(demo, "wrong_way"), demo.toString());
        Path motion = dir.resolve("motion.toml");
        Files.writeString(motion, String.join("\n", "[[camera]]", "id = \"yard-mast-2\"",
                "source = \"" + clip + "\"", "[[camera.zone]]", "id = \"lane-2-out\"",
                "polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]", ""));
        List<String> moving = replay(motion, clip, dir.resolve("motion"));
        assertTrue(has(moving, "motion"), moving.toString());
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({
        "tune/s23-lens-covered, view_blocked",
        "tune/s25-focus-lost, focus_lost",
        "held-out/s12-bumped-camera, camera_moved",
        "held-out/s24-picture-frozen, picture_frozen",
    })
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void suiteScenesWriteEachTamperKindInTheSchemasForm(String name, String kind, @TempDir Path dir)
            throws Exception {
        Scene scene = Scene.load(ProcessRunner.projectDir().resolve("test-streams/suite/" + name + ".scene.toml"));
        Path video = dir.resolve("scene.mp4");
        new SceneGenerator(scene).write(video, dir.resolve("scene.truth.json"));
        Path config = dir.resolve("site.toml");
        Files.writeString(config, ReplayEndToEndTest.configFor(scene, video));
        List<String> lines = replay(config, video, dir.resolve("report"));
        assertTrue(has(lines, kind), lines.toString());
    }
}
