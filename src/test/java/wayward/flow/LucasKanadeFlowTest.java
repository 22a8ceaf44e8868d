package wayward.flow;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.lang.management.ManagementFactory;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class LucasKanadeFlowTest {
    private static final int W = 320;
    private static final int H = 240;

    /** Mean endpoint error over the pixels at least {@code margin} from every border. */
    private static double meanEndpointError(FlowField f, double du, double dv, int margin) {
        double sum = 0;
        int n = 0;
        for (int y = margin; y < f.height - margin; y++) {
            for (int x = margin; x < f.width - margin; x++) {
                int i = y * f.width + x;
                sum += Math.hypot(f.u[i] - du, f.v[i] - dv);
                n++;
            }
        }
        return sum / n;
    }

    // Analytic ground truth: the second frame is the exact texture moved by (du, dv). Limits are the errors
    // measured for this estimator (FLOW-NOTES: a plain pyramidal LK of this kind reaches about 0.2 px) with
    // headroom; the message states the measured value.
    @ParameterizedTest(name = "translation ({0}, {1}) px, noise {2}")
    @CsvSource({
        "0.3, 0.0, 0, 0.08",
        "0.0, -1.5, 0, 0.10",
        "2.8, 2.8, 0, 0.15",
        "-10.0, 0.0, 0, 0.30",
        "1.5, -0.7, 2, 0.20",
    })
    void recoversKnownTranslation(double du, double dv, double noise, double maxError) {
        Textures t = new Textures(42, 12);
        SplittableRandom r = new SplittableRandom(7);
        byte[] a = t.render(W, H, 0, 0, noise, r);
        byte[] b = t.render(W, H, du, dv, noise, r);
        LucasKanadeFlow flow = new LucasKanadeFlow(W, H, FlowSettings.defaults());
        FlowField f = new FlowField(W, H);
        flow.compute(a, b, f);
        int margin = (int) Math.ceil(Math.hypot(du, dv)) + 4;
        double epe = meanEndpointError(f, du, dv, margin);
        System.out.printf(java.util.Locale.ROOT, "EPE translation (%.1f, %.1f) noise %.0f: %.4f px%n", du, dv, noise, epe);
        assertTrue(epe <= maxError, "mean endpoint error " + epe + " px (limit " + maxError + ")");
    }

    @Test
    void staticSceneGivesNoMotion() {
        Textures t = new Textures(3, 10);
        byte[] a = t.render(W, H, 0, 0, 0, null);
        LucasKanadeFlow flow = new LucasKanadeFlow(W, H, FlowSettings.defaults());
        FlowField f = new FlowField(W, H);
        flow.compute(a, a, f);
        assertTrue(meanEndpointError(f, 0, 0, 0) < 1e-4, "identical frames must give zero flow");
    }

    @Test
    void pushEstimatesBetweenConsecutiveFrames() {
        Textures t = new Textures(5, 12);
        LucasKanadeFlow flow = new LucasKanadeFlow(W, H, FlowSettings.defaults());
        FlowField f = new FlowField(W, H);
        assertEquals(false, flow.push(t.render(W, H, 0, 0, 0, null), f), "first frame has no predecessor");
        assertTrue(flow.push(t.render(W, H, 1.0, 0, 0, null), f));
        assertTrue(meanEndpointError(f, 1.0, 0, 6) < 0.1);
        assertTrue(flow.push(t.render(W, H, 1.0, 2.0, 0, null), f));
        assertTrue(meanEndpointError(f, 0, 2.0, 6) < 0.1, "second pair moves (0, 2)");
    }

    @Test
    void flatAreasHaveNoConfidenceAndTexturedOnesDo() {
        byte[] flat = new byte[W * H];
        java.util.Arrays.fill(flat, (byte) 90);
        LucasKanadeFlow flow = new LucasKanadeFlow(W, H, FlowSettings.defaults());
        FlowField f = new FlowField(W, H);
        flow.compute(flat, flat, f);
        for (float c : f.confidence) {
            assertEquals(0f, c, 1e-6f);
        }
        Textures t = new Textures(9, 12);
        byte[] tex = t.render(W, H, 0, 0, 0, null);
        flow.compute(tex, tex, f);
        assertTrue(f.confidence[(H / 2) * W + W / 2] > 1, "confidence " + f.confidence[(H / 2) * W + W / 2]);
    }

    @Test
    void straightEdgeHasNoConfidence() {
        // aperture problem (common practice): along a straight edge only the normal motion is defined
        byte[] edge = new byte[W * H];
        for (int y = 0; y < H; y++) {
            for (int x = 0; x < W; x++) {
                edge[y * W + x] = (byte) (x < W / 2 ? 40 : 200);
            }
        }
        LucasKanadeFlow flow = new LucasKanadeFlow(W, H, FlowSettings.defaults());
        FlowField f = new FlowField(W, H);
        flow.compute(edge, edge, f);
        int centre = (H / 2) * W + W / 2;
        assertEquals(0f, f.confidence[centre], 1e-3f);
        // but the edge itself is strong, and its normal is horizontal: the gradient points across the edge
        assertTrue(f.edge[centre] > 100, "edge " + f.edge[centre]);
        assertEquals(1f, Math.abs(f.normalX[centre]), 1e-4f);
        assertEquals(0f, f.normalY[centre], 1e-4f);
    }

    @Test
    void tinyAndOddFramesWork() {
        for (int[] size : new int[][] {{1, 1}, {2, 3}, {7, 5}, {33, 17}}) {
            int w = size[0];
            int h = size[1];
            LucasKanadeFlow flow = new LucasKanadeFlow(w, h, FlowSettings.defaults());
            FlowField f = new FlowField(w, h);
            byte[] a = new Textures(1, 6).render(w, h, 0, 0, 0, null);
            byte[] b = new Textures(1, 6).render(w, h, 0.5, 0, 0, null);
            flow.compute(a, b, f);
            for (int i = 0; i < w * h; i++) {
                assertTrue(Float.isFinite(f.u[i]) && Float.isFinite(f.v[i]), w + "x" + h + " pixel " + i);
            }
        }
    }

    @Test
    void rejectsFramesOfAnotherSize() {
        LucasKanadeFlow flow = new LucasKanadeFlow(8, 8, FlowSettings.defaults());
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> flow.compute(new byte[63], new byte[64], new FlowField(8, 8)));
        assertEquals("first: 63 pixels (expected 8x8 = 64)", e.getMessage());
    }

    @Test
    void boxSumMatchesPlainWindowSum() {
        SplittableRandom r = new SplittableRandom(11);
        for (int[] size : new int[][] {{1, 1}, {1, 9}, {9, 1}, {5, 5}, {13, 7}, {64, 48}}) {
            int w = size[0];
            int h = size[1];
            for (int radius = 1; radius <= 3; radius++) {
                float[] src = new float[w * h];
                for (int i = 0; i < src.length; i++) {
                    src[i] = (float) (r.nextDouble() * 200 - 100);
                }
                float[] fast = new float[w * h];
                LucasKanadeFlow.boxSum(src, fast, w, h, radius, new float[w * h], new float[w]);
                for (int y = 0; y < h; y++) {
                    for (int x = 0; x < w; x++) {
                        double plain = 0;
                        for (int dy = -radius; dy <= radius; dy++) {
                            for (int dx = -radius; dx <= radius; dx++) {
                                int xx = Math.max(0, Math.min(w - 1, x + dx));
                                int yy = Math.max(0, Math.min(h - 1, y + dy));
                                plain += src[yy * w + xx];
                            }
                        }
                        assertEquals(plain, fast[y * w + x], 1e-3 * (1 + Math.abs(plain)),
                                w + "x" + h + " r=" + radius + " at " + x + "," + y);
                    }
                }
            }
        }
    }

    @Test
    void allocatesNothingPerFrame() {
        Textures t = new Textures(2, 10);
        byte[] a = t.render(W, H, 0, 0, 0, null);
        byte[] b = t.render(W, H, 1, 0, 0, null);
        LucasKanadeFlow flow = new LucasKanadeFlow(W, H, FlowSettings.defaults());
        FlowField f = new FlowField(W, H);
        for (int i = 0; i < 20; i++) {
            flow.push(i % 2 == 0 ? a : b, f);
        }
        com.sun.management.ThreadMXBean mx = (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
        long id = Thread.currentThread().getId();
        long before = mx.getThreadAllocatedBytes(id);
        for (int i = 0; i < 50; i++) {
            flow.push(i % 2 == 0 ? a : b, f);
        }
        long perFrame = (mx.getThreadAllocatedBytes(id) - before) / 50;
        // a few bytes may be charged to the bean call itself; a frame-sized buffer would be ≥ 76 800 bytes
        assertTrue(perFrame < 64, "allocated " + perFrame + " bytes per frame");
    }
}
