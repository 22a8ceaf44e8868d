package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.scene.Scene;
import wayward.scene.SceneGenerator;

/**
 * A zone without heading_deg but with learn_heading_seconds, on the service ({@code run}, packaged jar): it
 * learns the lane's direction from four right-way tugs (the generator's script says they go straight up,
 * bearing 0°), keeps it in the data folder, then alerts on the truck coming down; {@code check} shows the
 * learned heading and the next start uses it without learning again.
 */
class LearnedHeadingIT {
    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void learnsTheHeadingFromTrafficKeepsItAndAlertsAgainstIt(@TempDir Path dir) throws Exception {
        Scene scene = Scene.load(ProcessRunner.projectDir().resolve("test-streams/learn-lane.scene.toml"));
        Path video = dir.resolve("learn-lane.mp4");
        new SceneGenerator(scene).write(video, dir.resolve("learn-lane.truth.json"));
        Path config = dir.resolve("site.toml");
        Files.writeString(config, String.join("\n", "[service]", "data_dir = \"data\"", "http = \"off\"", "[clips]",
                "enabled = false", "[[camera]]", "id = \"yard-mast-4\"", "source = \"" + video + "\"",
                "[[camera.zone]]", "id = \"lane\"",
                "polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]", "learn_heading_seconds = 6", ""));
        ProcessRunner.Result first = ProcessRunner.run(List.of("java", "-jar", ProcessRunner.jar().toString(), "run",
                "--config", config.toString()), dir, 120);
        assertEquals(0, first.exitCode(), first.stderr());
        Path kept = dir.resolve("data/learned/yard-mast-4/lane.heading");
        String text = Files.readString(kept);
        double learned = Double.parseDouble(text.substring(text.indexOf("heading_deg = ") + 14).trim());
        // the tugs' bearing is 0° exactly (scripted straight up); the histogram bins are 22.5° wide
        assertEquals(0, Math.abs(((learned + 180) % 360) - 180), 5, "learned " + learned);
        assertTrue(first.stderr().contains("zone lane: learned heading"), first.stderr());

        List<Map<String, Object>> events = YardSite.events(dir.resolve("data/events.jsonl"));
        assertEquals(2, events.size(), "the truck's start and end, nothing while learning: " + events);
        Map<String, Object> start = events.get(0);
        assertEquals("wrong_way", start.get("kind"));
        double truckEnters = scene.movers().get(4).insideInterval(scene.zones().get(0), 1 / scene.fps())[0];
        double t = (Double) start.get("stream_s");
        assertTrue(t >= truckEnters - 0.3 && t <= truckEnters + 1.5, "start " + t + " for the truck entering at "
                + truckEnters);

        ProcessRunner.Result check = ProcessRunner.run(List.of("java", "-jar", ProcessRunner.jar().toString(),
                "check", "--config", config.toString()), dir, 60);
        assertTrue(check.stdout().contains("# camera yard-mast-4 zone lane: learned heading_deg = "), check.stdout());

        // the next start uses what was learned from its first frame, without learning again
        ProcessRunner.Result second = ProcessRunner.run(List.of("java", "-jar", ProcessRunner.jar().toString(), "run",
                "--config", config.toString()), dir, 120);
        assertTrue(second.stderr().contains("learned earlier"), second.stderr());
        assertEquals(4, YardSite.events(dir.resolve("data/events.jsonl")).size(), "again the truck only");
    }
}
