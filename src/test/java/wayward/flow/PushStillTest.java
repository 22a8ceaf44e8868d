package wayward.flow;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** {@link FlowEstimator#pushStill}: a skipped frame still becomes the next pair's earlier frame. */
class PushStillTest {
    private static final int W = 96;
    private static final int H = 72;

    @Test
    void aFrameFedAsStillIsTheEarlierFrameOfTheNextPairExactlyAsIfItHadBeenPushed() {
        Textures t = new Textures(7, 12);
        byte[] a = t.render(W, H, 0, 0, 0, null);
        byte[] b = t.render(W, H, 0.5, 0, 0, null);
        byte[] c = t.render(W, H, 2.0, 1.0, 0, null);
        FlowEstimator gated = FlowEstimator.create(W, H, FlowSettings.defaults());
        FlowEstimator reference = FlowEstimator.create(W, H, FlowSettings.defaults());
        FlowField f = gated.newField();
        FlowField expected = reference.newField();
        gated.push(a, f);
        gated.pushStill(b, f);
        for (int i = 0; i < f.u.length; i++) {
            assertEquals(0f, f.u[i]);
            assertEquals(0f, f.v[i]);
        }
        assertTrue(gated.push(c, f));
        // the reference: the flow from b to c computed directly (the same kernel, so bit for bit)
        reference.compute(b, c, expected);
        assertArrayEquals(expected.u, f.u);
        assertArrayEquals(expected.v, f.v);
        // and it is the motion of the texture, 1.5 px right and 1 px down (analytic: the renderer's shift)
        double sum = 0;
        int n = 0;
        for (int j = 2; j < f.height - 2; j++) {
            for (int i = 2; i < f.width - 2; i++) {
                int g = j * f.width + i;
                sum += Math.hypot(f.u[g] - 1.5, f.v[g] - 1.0);
                n++;
            }
        }
        assertTrue(sum / n < 0.2, "mean endpoint error " + sum / n);
        gated.close();
        reference.close();
    }

    @Test
    void aResetForgetsTheStillFrame() {
        Textures t = new Textures(3, 10);
        FlowEstimator e = FlowEstimator.create(W, H, FlowSettings.defaults());
        FlowField f = e.newField();
        e.push(t.render(W, H, 0, 0, 0, null), f);
        e.pushStill(t.render(W, H, 1, 0, 0, null), f);
        e.reset();
        assertEquals(false, e.push(t.render(W, H, 2, 0, 0, null), f), "after a reset the next frame starts afresh");
        e.close();
    }
}
