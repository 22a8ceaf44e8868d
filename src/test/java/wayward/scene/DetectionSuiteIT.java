package wayward.scene;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.api.Timeout;

/**
 * The detection suite against its targets (issue "Detection you can trust", issue 16). Ground truth: our
 * generator's script of every mover (test-streams/suite/{tune,held-out}/*.scene.toml). Beside wayward run two
 * references on the same video: OpenCV's MOG2 through JavaCV (direction-blind: it must show what plain motion
 * detection does, firing on right-way traffic and nuisances) and OpenCV's DIS-MEDIUM flow through JavaCV with our
 * zone rule (direction-aware). The tables are written to target/suite/scores.md. The suite is rendered and scored
 * once for all tests of this class.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class DetectionSuiteIT {
    /** The 25 scenarios the suite had before it grew and was split (s01 to s25, now in both halves). */
    private static boolean original(String scenario) {
        return scenario.matches("s(0[1-9]|1[0-9]|2[0-5])-.*");
    }

    private List<DetectionSuite.Row> rows;
    private String table;

    @BeforeAll
    @Timeout(value = 20, unit = TimeUnit.MINUTES)
    void renderAndScoreTheSuite() throws Exception {
        long started = System.nanoTime();
        rows = DetectionSuite.run(Path.of("test-streams/suite"), Path.of("target/suite"));
        table = DetectionSuite.table(rows);
        Files.writeString(Path.of("target/suite/scores.md"), table + String.format(Locale.ROOT,
                "%nRendered and scored in %.0f s.%n", (System.nanoTime() - started) / 1e9));
    }

    /**
     * What this test asserted before the suite grew, on the same 25 scenarios, for today's detector: over them
     * recall ≥ 0.98, no false alert where no mover goes the wrong way, latency ≤ hold + 0.5 s, and the MOG2
     * baseline fires at least 10 times on normal traffic and nuisances; tampering (covered lens, frozen picture,
     * lost focus, a knocked camera) raises its own event kind within 5 s, and nothing else raises one.
     */
    @Test
    void originalScenariosStillMeetTheTargetsAndPlainMotionDetectionDoesNot() {
        assertTrue(rows.size() >= 45, "at least 45 scenarios: " + rows.size());
        int passages = 0;
        int caught = 0;
        int baselineFalse = 0;
        int originals = 0;
        for (DetectionSuite.Row r : rows) {
            DetectionSuite.Score ours = r.ours();
            if (!original(ours.scenario())) {
                continue;
            }
            if (ours.tamperExpected() != null) {
                assertTrue(ours.tamperCaught(), ours.scenario() + ": " + ours.tamperExpected() + " within 5 s\n" + table);
            }
            assertEquals(0, ours.falseTamper(), ours.scenario() + ": no other tamper alert\n" + table);
            originals++;
            passages += ours.passages();
            caught += ours.caught();
            baselineFalse += r.mog2().falseAlerts();
            if (ours.nuisance()) {
                assertEquals(0, ours.falseAlerts(), ours.scenario() + ": no false alert\n" + table);
            }
            if (!Double.isNaN(ours.maxLatency())) {
                assertTrue(ours.maxLatency() <= 0.5, ours.scenario() + ": latency over hold " + ours.maxLatency() + "\n" + table);
            }
        }
        assertEquals(25, originals, "the original scenarios are all there");
        assertTrue(passages >= 10, "enough wrong-way passages to measure recall: " + passages);
        assertTrue((double) caught / passages >= 0.98, "recall " + caught + "/" + passages + "\n" + table);
        assertTrue(baselineFalse >= 10, "the motion baseline fires on normal traffic and nuisances: " + baselineFalse);
    }

    /**
     * The targets of issue 16 on the held-out half, which no default was chosen on: recall ≥ 0.98, no false
     * alert in a scenario without a wrong-way passage, onset latency ≤ hold + 0.5 s in every scenario; and, as
     * before, tampering raises its own kind within 5 s and nothing else raises a tamper alert. Owned by
     * the movers work (deciding on tracked movers instead of zone shares). TODAY'S DETECTOR (zone shares, as on
     * branch suite at the split) FAILS THIS TEST; the scenarios it fails are listed in DEVELOPERS.md ("Detection
     * suite") and in the failure message. The levels are not to be lowered to make it pass.
     */
    @Test
    void heldOutHalfMeetsTheTargetsOfIssue16() {
        List<String> failures = new ArrayList<>();
        int passages = 0;
        int caught = 0;
        for (DetectionSuite.Row r : rows) {
            if (!r.half().equals("held-out")) {
                continue;
            }
            DetectionSuite.Score ours = r.ours();
            passages += ours.passages();
            caught += ours.caught();
            if (ours.caught() < ours.passages()) {
                failures.add(ours.scenario() + ": caught " + ours.caught() + " of " + ours.passages());
            }
            if (ours.nuisance() && ours.falseAlerts() > 0) {
                failures.add(ours.scenario() + ": " + ours.falseAlerts() + " false alert(s) without a wrong-way mover");
            }
            if (ours.tamperExpected() != null && !ours.tamperCaught()) {
                failures.add(ours.scenario() + ": " + ours.tamperExpected() + " not raised within 5 s");
            }
            if (ours.falseTamper() > 0) {
                failures.add(ours.scenario() + ": " + ours.falseTamper() + " tamper alert(s) of the wrong kind or time");
            }
            if (!Double.isNaN(ours.maxLatency()) && ours.maxLatency() > 0.5) {
                failures.add(String.format(Locale.ROOT, "%s: onset %.2f s after hold (at most 0.5 s)", ours.scenario(),
                        ours.maxLatency()));
            }
        }
        assertTrue(passages >= 15, "enough held-out wrong-way passages to measure recall: " + passages);
        double recall = (double) caught / passages;
        String message = String.format(Locale.ROOT, "held-out recall %d/%d = %.3f (at least 0.98)%n%s%n%s", caught,
                passages, recall, String.join("\n", failures), table);
        assertTrue(recall >= 0.98, message);
        List<String> perScene = failures.stream().filter(f -> !f.contains("caught")).toList();
        assertTrue(perScene.isEmpty(), message);
    }
}
