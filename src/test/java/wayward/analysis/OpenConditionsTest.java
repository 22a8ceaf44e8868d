package wayward.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.config.ConfigLoader;
import wayward.config.SiteConfig;
import wayward.scene.Scene;
import wayward.scene.SceneGenerator;

/**
 * A camera's open tamper conditions ({@link CameraStatus#conditions()}, shown by {@code /api/cameras} and the site
 * page as "tampered"): the detection suite's lens-covered scene (test-streams/suite/tune/s23-lens-covered, rendered
 * by our own generator; its ground truth: the lens is covered at 5 s and stays covered) replayed through a camera.
 * The condition is listed from its start on and gone once its end went out (at the end of the stream).
 */
class OpenConditionsTest {
    @TempDir
    Path dir;

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void aCoveredLensIsListedFromItsStartToItsEnd() throws Exception {
        Path sceneFile = Path.of("test-streams/suite/tune/s23-lens-covered.scene.toml").toAbsolutePath();
        Path video = dir.resolve("covered.mp4");
        new SceneGenerator(Scene.load(sceneFile)).write(video, dir.resolve("covered.truth.json"));
        Path conf = dir.resolve("site.toml");
        Files.writeString(conf, "[[camera]]\nid = \"yard-mast-4\"\nsource = \"" + video + "\"\n"
                + "[[camera.zone]]\nid = \"lane\"\n"
                + "polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]\nheading_deg = 0\n");
        SiteConfig site = ConfigLoader.load(conf);
        // each tamper phase with the conditions listed when it went out (the consumer runs on the analysis thread,
        // after the list followed the phase)
        List<String> seen = new CopyOnWriteArrayList<>();
        CameraPipeline[] camera = new CameraPipeline[1];
        camera[0] = new CameraPipeline(site.cameras().get(0), site.flow(), e -> {
            if (e.kind().jsonName().equals("view_blocked")) {
                seen.add(e.phase().jsonName() + " " + camera[0].conditions());
            }
        }, Clock.systemUTC(), true, false, 1);
        assertEquals(List.of(), camera[0].conditions(), "nothing open before the first frame");
        camera[0].start();
        assertTrue(camera[0].join(100_000), "the replay ended");
        assertEquals(List.of("start [view_blocked]", "end []"), seen);
        assertEquals(List.of(), camera[0].conditions());
    }
}
