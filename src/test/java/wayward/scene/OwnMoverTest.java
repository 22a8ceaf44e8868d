package wayward.scene;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/**
 * The suite's check of who started an event ({@link DetectionSuite#ownMover}) on the tune half's s36, whose script
 * is known: a creeper 0.12 × 0.20 of a 640 × 360 picture (76.8 × 72 px, half its diagonal 52.6 px), from (0.5, 0.12)
 * to (0.5, 0.626) between 1.5 and 14.5 s, so at 8 s its centre is (320, 134.3) px.
 */
class OwnMoverTest {
    @Test
    void aStartCountsAsTheMoversOwnOnlyWhereTheScriptPutsTheMover() throws Exception {
        Scene scene = Scene.load(Path.of("test-streams/suite/tune/s36-crawl-in-noise.scene.toml"));
        DetectionSuite.Passage p = new DetectionSuite.Passage("creeper", "lane", 1.5, 14.5);
        double y = 0.12 + 0.506 * 6.5 / 13;
        assertTrue(DetectionSuite.ownMover(scene, p, new DetectionSuite.Detection("lane", "wrong_way", 8, 0.5, y)));
        // half the diagonal + 12 px = 64.6 px: 60 px to the side is the mover's, 70 px is not
        assertTrue(DetectionSuite.ownMover(scene, p,
                new DetectionSuite.Detection("lane", "wrong_way", 8, 0.5 - 60.0 / 640, y)));
        assertFalse(DetectionSuite.ownMover(scene, p,
                new DetectionSuite.Detection("lane", "wrong_way", 8, 0.5 - 70.0 / 640, y)));
        // where the creeper will be 6 s later (84 px further down) is not where it is
        assertFalse(DetectionSuite.ownMover(scene, p,
                new DetectionSuite.Detection("lane", "wrong_way", 8, 0.5, y + 0.506 * 6 / 13)));
        // a reference's start has no mover to place
        assertFalse(DetectionSuite.ownMover(scene, p, new DetectionSuite.Detection("lane", 8)));
    }
}
