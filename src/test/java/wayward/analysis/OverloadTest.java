package wayward.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import wayward.config.ConfigLoader;
import wayward.config.SiteConfig;
import wayward.delivery.LogCapture;

/**
 * A camera whose analysis is slower than its frames come: the demo clip played as a live 15 fps camera while
 * every analysed frame is held up 250 ms on the analysis thread (a stand-in for an overloaded box). Capture must
 * keep the camera's pace, the analysis rate sink instead (logged once, shown by {@code analysisFps}), and both
 * recover when the analysis is fast again.
 */
class OverloadTest {
    @TempDir
    Path dir;

    private volatile boolean slow = true;

    @Test
    void analysisRateSinksWhileCaptureKeepsPaceAndRecovers() throws Exception {
        Path clip = Path.of("test-streams/yard-lane.mp4").toAbsolutePath();
        Path conf = dir.resolve("site.toml");
        Files.writeString(conf, "[[camera]]\nid = \"lane2\"\nsource = \"" + clip + "\"\nloop = true\n"
                + "analysis_fps = 10\n[[camera.zone]]\nid = \"lane\"\n"
                + "polygon = [[0.3, 0.1], [0.7, 0.1], [0.7, 0.9], [0.3, 0.9]]\nheading_deg = 0\n");
        SiteConfig site = ConfigLoader.load(conf);
        CameraPipeline p = new CameraPipeline(site.cameras().get(0), site.flow(), e -> { }, Clock.systemUTC(),
                false, true, 0);
        p.listenFrames((pipeline, frame, field, t) -> {
            if (slow) {
                try {
                    Thread.sleep(250);
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
            }
        });
        try (LogCapture log = new LogCapture(CameraPipeline.class)) {
            p.start();
            Thread.sleep(1000); // opening the file and the first frames
            long in0 = p.framesIn();
            long t0 = System.nanoTime();
            p.checkLoad(1); // starts the counting window
            Thread.sleep(4000);
            double seconds = (System.nanoTime() - t0) / 1e9;
            p.checkLoad(seconds);
            long decoded = p.framesIn() - in0;
            // capture keeps the camera's 15 frames a second (the clip's rate) though analysis lags far behind
            assertTrue(decoded >= 0.8 * 15 * seconds, decoded + " frames decoded in " + seconds + " s");
            // at most 4 frames a second get through a 250 ms analysis; the rest are replaced in the slot
            assertTrue(p.analysisFps() > 0.5 && p.analysisFps() <= 4.2, "analysis fps " + p.analysisFps());
            assertTrue(p.droppedFrames() > 0, "frames dropped: " + p.droppedFrames());
            List<String> behind = log.lines().stream().filter(l -> l.contains("cannot keep up")).toList();
            assertEquals(1, behind.size(), log.lines().toString());
            assertTrue(behind.get(0).startsWith("WARN camera lane2: analysis cannot keep up: "), behind.get(0));

            slow = false;
            Thread.sleep(1000); // the slot hands over the newest frame; the backlog is gone at once
            p.checkLoad(1);
            long t1 = System.nanoTime();
            Thread.sleep(3000);
            p.checkLoad((System.nanoTime() - t1) / 1e9);
            // 10 a second are due; the 15 fps clip gives 10 (every 1.5th frame, on the frame grid)
            assertTrue(p.analysisFps() >= 8.5, "analysis fps after recovery " + p.analysisFps());
            assertTrue(log.lines().stream().anyMatch(l -> l.startsWith("INFO camera lane2: analysis keeps up again")),
                    log.lines().toString());
            assertEquals(1, log.lines().stream().filter(l -> l.contains("cannot keep up")).count());
            assertEquals(0, p.decodeErrors());
        } finally {
            p.stop();
            p.join(5000);
        }
    }
}
