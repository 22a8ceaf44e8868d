package wayward.analysis;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;
import java.util.function.DoubleUnaryOperator;
import org.junit.jupiter.api.Test;
import wayward.image.GrayFrame;

class StillGateTest {
    private static final int W = 160;
    private static final int H = 90;
    private static final double DT = 0.1;
    /**
     * How much lighter than the ground the faint mover is, grey levels. At 20 the gate learned 11.8 grey levels of
     * noise from the first mover (learning from its frames judged still; 12.0 with only the warm-up's median) and
     * skipped all 15 frames of the second; it learns 4–5 from still frames alone.
     */
    private static final double LIFT = 20;

    /** A textured still ground with Gaussian noise of σ grey levels, and a 12 × 12 px block of 200 at (x, y). */
    private static GrayFrame frame(Random noise, double sigma, double x, double y, double gain) {
        return frame(noise, sigma, x, y, gain, ground -> 200);
    }

    /** The same with the block's grey level given by the ground's under it (a faint mover: the ground a little lighter). */
    private static GrayFrame frame(Random noise, double sigma, double x, double y, double gain, DoubleUnaryOperator block) {
        GrayFrame f = new GrayFrame(W, H);
        for (int j = 0; j < H; j++) {
            for (int i = 0; i < W; i++) {
                double v = 90 + 30 * Math.sin(i * 0.37) * Math.cos(j * 0.23);
                // the block, with area coverage at its sub-pixel edges (x, y: its top-left corner)
                double cx = Math.max(0, Math.min(i + 1, x + 12) - Math.max(i, x));
                double cy = Math.max(0, Math.min(j + 1, y + 12) - Math.max(j, y));
                v += cx * cy * (block.applyAsDouble(v) - v);
                v = v * gain + sigma * noise.nextGaussian();
                f.pixels[j * W + i] = (byte) Math.max(0, Math.min(255, Math.round(v)));
            }
        }
        return f;
    }

    private static StillGate gate() {
        // a zone over the middle of the picture: x 0.3..0.7, y 0.3..0.7
        return new StillGate(List.of(new double[] {0.3, 0.7, 0.7, 0.3}), List.of(new double[] {0.3, 0.3, 0.7, 0.7}), W, H);
    }

    @Test
    void aStillNoisyPictureSkipsTheFlowAfterWarmUpAndKeep() {
        Random r = new Random(1);
        StillGate g = gate();
        int run = 0;
        for (int n = 0; n < 60; n++) {
            if (g.changed(frame(r, 3, -50, -50, 1), n * DT)) {
                run++;
            }
        }
        // warm-up (1 s) and keep (2 s) run the flow: about 31 frames; the other 29 are still
        assertTrue(run <= 32, "frames run " + run);
        assertTrue(g.noise() > 0.5 && g.noise() < 12, "learned noise " + g.noise());
    }

    @Test
    void aMoverEnteringTheMarginRunsTheFlowOnThatVeryFrame() {
        Random r = new Random(2);
        StillGate g = gate();
        double t = 0;
        for (int n = 0; n < 40; n++, t += DT) {
            g.changed(frame(r, 3, -50, -50, 1), t);
        }
        assertFalse(g.changed(frame(r, 3, -50, -50, 1), t), "still before the mover");
        t += DT;
        // the zone's box starts at x = 48; the block's right edge reaches x = 40, inside the 16 px margin
        assertTrue(g.changed(frame(r, 3, 28, 40, 1), t), "first frame with the mover");
    }

    @Test
    void aCrawlOfAFifthOfAPixelAFrameIsSeenWithinTheReferenceAge() {
        Random r = new Random(3);
        StillGate g = gate();
        double t = 0;
        double x = 70;
        for (int n = 0; n < 40; n++, t += DT) {
            g.changed(frame(r, 3, x, 40, 1), t);
        }
        assertFalse(g.changed(frame(r, 3, x, 40, 1), t));
        int framesToSee = -1;
        for (int n = 1; n <= 20; n++) {
            t += DT;
            x += 0.2;
            if (g.changed(frame(r, 3, x, 40, 1), t)) {
                framesToSee = n;
                break;
            }
        }
        // between frames 0.2 px changes an edge block's mean by 0.2 × 110 × 4 / 16 = 5.5 grey levels at most,
        // within this noise's reach; against the reference (at most 1 s old) the change adds up
        assertTrue(framesToSee > 0 && framesToSee <= 1 + (int) Math.round(StillGate.REFERENCE_SECONDS / DT),
                "frames to see the crawl: " + framesToSee);
    }

    @Test
    void aLightSwitchedOnIsNotMotion() {
        Random r = new Random(4);
        StillGate g = gate();
        double t = 0;
        for (int n = 0; n < 40; n++, t += DT) {
            g.changed(frame(r, 1, -50, -50, 1), t);
        }
        assertFalse(g.changed(frame(r, 1, -50, -50, 1.0), t));
        t += DT;
        // a gain step of 4 % shifts every block by 3–5 grey levels: the median step is taken off
        assertFalse(g.changed(frame(r, 1, -50, -50, 1.04), t));
    }

    @Test
    void aFaintMoverPassingWhileTheCameraStartsIsNotLearnedAsNoise() {
        // a mover only a little lighter than the ground enters in the warm-up's last 0.4 s and crosses for 2.5 s;
        // after a still second a second one like it comes: the gate must run the flow for it
        Random r = new Random(5);
        StillGate g = gate();
        DoubleUnaryOperator faint = ground -> ground + LIFT;
        double t = 0;
        for (int n = 0; n < 6; n++, t += DT) {
            g.changed(frame(r, 3, -50, -50, 1), t);
        }
        for (int n = 0; n < 25; n++, t += DT) {
            g.changed(frame(r, 3, 30 + 3 * n, 40, 1, faint), t);
        }
        for (int n = 0; n < 10; n++, t += DT) {
            g.changed(frame(r, 3, -50, -50, 1), t);
        }
        int run = 0;
        for (int n = 0; n < 15; n++, t += DT) {
            run += g.changed(frame(r, 3, 30 + 3 * n, 40, 1, faint), t) ? 1 : 0;
        }
        assertTrue(run == 15, "frames of the second faint mover with the flow run: " + run + " of 15 (noise learned "
                + g.noise() + ")");
    }
}
