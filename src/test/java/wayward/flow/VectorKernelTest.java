package wayward.flow;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.lang.management.ManagementFactory;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The vector kernel must change nothing but the time: the flow it gives is the scalar kernel's to the bit, on the
 * object-motion benchmark's scenes (movers over still ground, real photographs from Debian's opencv-doc, noise) and
 * on pictures whose grid rows are not a multiple of the vector's lanes; its window sums are the scalar ones to the
 * bit and the sums' definition within float rounding. The flow itself is checked against analytic truth and OpenCV
 * elsewhere ({@link ObjectMotionTest}, {@link OpenCvReferenceTest}).
 */
class VectorKernelTest {
    @Test
    void theTestsRunTheVectorKernel() {
        // the build starts the test JVM with --add-modules jdk.incubator.vector (pom.xml); without it every test
        // here would compare the point-by-point fill with itself
        assertTrue(FlowKernel.vectorLanes() > 0, "the test JVM lacks jdk.incubator.vector");
        assertTrue(FlowEstimator.instructions().contains("vector instructions ("), FlowEstimator.instructions());
    }

    @Test
    void windowSumsAreTheDefinitionsAndTheSameInBothKernels() {
        int w = 61;
        int h = 23;
        float[] i0 = new float[w * h];
        float[] i1 = new float[w * h];
        java.util.SplittableRandom r = new java.util.SplittableRandom(7);
        for (int i = 0; i < i0.length; i++) {
            i0[i] = r.nextInt(256);
            i1[i] = r.nextInt(256);
        }
        float[] scalar = new float[FlowKernel.SUMS_LENGTH];
        float[] vector = new float[FlowKernel.SUMS_LENGTH];
        FlowKernel kernel = new VectorKernel();
        int windows = 0;
        // up to the widest window the settings take (a 15 × 15 one, radius 7)
        for (int side = 3; side <= 15; side += 2) {
            // every window whose one-pixel frame lies in the picture, the last rows and columns included (where
            // the vector variant's whole rows of lanes would leave the array, it sums one by one)
            for (int y = 1; y + side < h - 1; y++) {
                for (int x = 1; x + side < w - 1; x++) {
                    int corner = y * w + x;
                    int shift = -w + 1;
                    float ax = 0.3f;
                    float ay = 0.6f;
                    float w00 = (1 - ax) * (1 - ay);
                    float w01 = ax * (1 - ay);
                    float w10 = (1 - ax) * ay;
                    float w11 = ax * ay;
                    FlowKernel.SCALAR.windowSums(i0, i1, w, corner, shift, side, w00, w01, w10, w11, scalar);
                    kernel.windowSums(i0, i1, w, corner, shift, side, w00, w01, w10, w11, vector);
                    String at = "side " + side + " at " + x + "," + y;
                    assertArrayEquals(java.util.Arrays.copyOf(scalar, 10), java.util.Arrays.copyOf(vector, 10), at);
                    // the definitions, in double precision: t the earlier picture, ix and iy its central
                    // differences, d the later picture sampled bilinearly at the shift less t
                    double[] want = new double[10];
                    for (int dy = 0; dy < side; dy++) {
                        for (int dx = 0; dx < side; dx++) {
                            int p = corner + dy * w + dx;
                            double t = i0[p];
                            double ix = i0[p + 1] - i0[p - 1];
                            double iy = i0[p + w] - i0[p - w];
                            int q = p + shift;
                            double d = w00 * i1[q] + w01 * i1[q + 1] + w10 * i1[q + w] + w11 * i1[q + w + 1] - t;
                            double[] terms = {t, ix, iy, ix * ix, ix * iy, iy * iy, d, ix * d, d * d, iy * d};
                            for (int i = 0; i < 10; i++) {
                                want[i] += terms[i];
                            }
                        }
                    }
                    for (int i = 0; i < 10; i++) {
                        // float sums of at most 64 terms of up to 65 025 each: within 1e-5 of the largest term's scale
                        assertEquals(want[i], vector[i], 1e-5 * side * side * 65025, at + " sum " + i);
                    }
                    windows++;
                }
            }
        }
        assertTrue(windows > 1000, "windows: " + windows);
    }

    @Test
    void rowStepsSolveTheRegularisedSystemAndAreTheSameInBothKernels() {
        // a row of 37 windows (not a whole number of vectors) of a noisy picture pair, and one flat window
        int w = 200;
        int h = 9;
        int points = 37;
        float[] i0 = new float[w * h];
        float[] i1 = new float[w * h];
        java.util.SplittableRandom r = new java.util.SplittableRandom(11);
        for (int i = 0; i < i0.length; i++) {
            i0[i] = r.nextInt(256);
            i1[i] = r.nextInt(256);
        }
        float lambda = 25f;
        StepRow[] rows = {new StepRow(points), new StepRow(points)};
        float[] sums = new float[FlowKernel.SUMS_LENGTH];
        for (int i = 0; i < points; i++) {
            float ax = (float) r.nextDouble();
            float ay = (float) r.nextDouble();
            FlowKernel.scalarWindowSums(i0, i1, w, 2 * w + 1 + 5 * i, w + 1, 5, (1 - ax) * (1 - ay), ax * (1 - ay),
                    (1 - ax) * ay, ax * ay, sums);
            float u0 = (float) r.nextDouble() * 4 - 2;
            float v0 = (float) r.nextDouble() * 4 - 2;
            for (StepRow row : rows) {
                for (int s = 0; s < 10; s++) {
                    row.sums[s * row.stride + i] = i == points - 1 ? 0f : sums[s];
                }
                row.u0[i] = u0;
                row.v0[i] = v0;
            }
        }
        for (StepRow row : rows) {
            row.pixels = 25f;
            row.lambda = lambda;
            row.first = 3;
            row.u = new float[points + 3];
            row.v = new float[points + 3];
            row.confidence = new float[points + 3];
            row.a = new float[points + 3];
            row.b = new float[points + 3];
            row.c = new float[points + 3];
            row.mean = new float[points + 3];
            row.windowMean = new float[points + 3];
            row.residual = new float[points + 3];
        }
        FlowKernel.SCALAR.steps(rows[0], points);
        new VectorKernel().steps(rows[1], points);
        StepRow scalar = rows[0];
        StepRow vector = rows[1];
        for (float[][] pair : new float[][][] {{scalar.u, vector.u}, {scalar.v, vector.v},
                {scalar.confidence, vector.confidence}, {scalar.a, vector.a}, {scalar.b, vector.b},
                {scalar.c, vector.c}, {scalar.mean, vector.mean}, {scalar.windowMean, vector.windowMean},
                {scalar.residual, vector.residual}}) {
            assertArrayEquals(pair[0], pair[1]);
        }
        // the least-squares step in double precision (the gradients are central differences, halved; the
        // brightness offset between the frames an extra unknown): G·δ = −b with G the mean-free structure tensor
        // plus λ on its diagonal, b the mean-free Σ∇I·d
        for (int i = 0; i < points - 1; i++) {
            double n = 25;
            double[] q = new double[10];
            for (int s = 0; s < 10; s++) {
                q[s] = scalar.sums[s * scalar.stride + i];
            }
            double sx = q[1] / 2;
            double sy = q[2] / 2;
            double cxx = q[3] / 4 - sx * sx / n;
            double cxy = q[4] / 4 - sx * sy / n;
            double cyy = q[5] / 4 - sy * sy / n;
            double bx = q[7] / 2 - sx * q[6] / n;
            double by = q[9] / 2 - sy * q[6] / n;
            double a = cxx + lambda;
            double c = cyy + lambda;
            double det = a * c - cxy * cxy;
            double du = -(c * bx - cxy * by) / det;
            double dv = -(a * by - cxy * bx) / det;
            double smaller = ((cxx + cyy) - Math.sqrt((cxx - cyy) * (cxx - cyy) + 4 * cxy * cxy)) / 2 / n;
            int g = 3 + i;
            String at = "point " + i;
            assertEquals(scalar.u0[i] + du, scalar.u[g], 1e-3 * (1 + Math.abs(du)), at);
            assertEquals(scalar.v0[i] + dv, scalar.v[g], 1e-3 * (1 + Math.abs(dv)), at);
            assertEquals(smaller, scalar.confidence[g], 1e-3 * (1 + Math.abs(cxx + cyy) / n), at);
            assertEquals(cxy / n, scalar.b[g], 1e-3 * (1 + Math.abs(cxy / n)), at);
            assertEquals(q[0] / n, scalar.windowMean[g], 1e-3, at);
        }
        // a flat window: no structure, no step; without the regulariser its system is singular, nothing is solved
        // and the residual stays unknown
        int flat = 3 + points - 1;
        assertEquals(scalar.u0[points - 1], scalar.u[flat]);
        assertEquals(0f, scalar.confidence[flat]);
        for (StepRow row : rows) {
            row.lambda = 0f;
        }
        FlowKernel.SCALAR.steps(scalar, points);
        new VectorKernel().steps(vector, points);
        assertArrayEquals(scalar.residual, vector.residual);
        assertArrayEquals(scalar.u, vector.u);
        assertEquals(GridLucasKanadeFlow.UNKNOWN_RESIDUAL, vector.residual[flat]);
        assertEquals(vector.u0[points - 1], vector.u[flat]);
    }

    @Test
    void objectScenesGiveTheSameFlowToTheBit() {
        List<ObjectMotionCase> cases = ObjectMotionBench.cases(ObjectMotionBench.Half.TUNE, 11);
        assertTrue(cases.size() >= 20, "cases: " + cases.size());
        int w = ObjectMotionCase.WIDTH;
        int h = ObjectMotionCase.HEIGHT;
        try (GridLucasKanadeFlow points = new GridLucasKanadeFlow(w, h, FlowSettings.defaults(), FlowKernel.SCALAR);
                GridLucasKanadeFlow vector = new GridLucasKanadeFlow(w, h, FlowSettings.defaults(),
                        new VectorKernel())) {
            for (ObjectMotionCase c : cases) {
                ObjectMotionCase.Frames f = c.render();
                assertSame(points.computeDense(f.first(), f.second()), vector.computeDense(f.first(), f.second()),
                        c.toString());
            }
        }
    }

    @Test
    void otherSizesAndSettingsGiveTheSameFlowToTheBit() {
        FlowSettings[] settings = {FlowSettings.defaults(), FlowSettings.defaults().withThreads(2),
            FlowSettings.defaults().withWindowRadius(3), FlowSettings.defaults().withIterations(3, 3)};
        int[][] sizes = {{160, 120}, {321, 179}, {640, 360}, {100, 20}};
        for (FlowSettings s : settings) {
            for (int[] wh : sizes) {
                byte[][] ab = BenchFrames.pair(wh[0], wh[1]);
                try (GridLucasKanadeFlow points = new GridLucasKanadeFlow(wh[0], wh[1], s, FlowKernel.SCALAR);
                        GridLucasKanadeFlow vector = new GridLucasKanadeFlow(wh[0], wh[1], s, new VectorKernel())) {
                    FlowField p = points.newField();
                    FlowField v = vector.newField();
                    // a stream of frames: each push starts from the state the last one left
                    for (int i = 0; i < 4; i++) {
                        byte[] frame = ab[i & 1];
                        points.push(frame, p);
                        vector.push(frame, v);
                        assertSame(p, v, s + " " + wh[0] + "x" + wh[1] + " push " + i);
                    }
                }
            }
        }
    }

    @Test
    void allocatesNothingPerFrameOnceCompiled() {
        // the vectors are objects until C2 compiles the kernel into registers (the first few dozen frames); after
        // that a frame must allocate nothing. Rounds of 50 frames until one stays under the bound, for at most 40
        // rounds (a few seconds), so that a slow compile on a busy machine is waited for, not failed.
        byte[][] ab = BenchFrames.pair(320, 240);
        FlowSettings defaults = FlowSettings.defaults();
        try (GridLucasKanadeFlow flow = new GridLucasKanadeFlow(320, 240, defaults, new VectorKernel())) {
            FlowField f = flow.newField();
            com.sun.management.ThreadMXBean mx = (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
            long id = Thread.currentThread().getId();
            long perFrame = Long.MAX_VALUE;
            for (int round = 0; round < 40 && perFrame >= 64; round++) {
                long before = mx.getThreadAllocatedBytes(id);
                for (int i = 0; i < 50; i++) {
                    flow.push(ab[i & 1], f);
                }
                perFrame = (mx.getThreadAllocatedBytes(id) - before) / 50;
            }
            // a few bytes may be charged to the bean call itself; one vector left boxed per pass would be ~1 kB
            assertTrue(perFrame < 64, "allocated " + perFrame + " bytes per frame");
        }
    }

    private static void assertSame(FlowField expected, FlowField actual, String what) {
        // Arrays.equals on floats compares the bits (floatToIntBits)
        assertArrayEquals(expected.u, actual.u, what + ": u");
        assertArrayEquals(expected.v, actual.v, what + ": v");
        assertArrayEquals(expected.confidence, actual.confidence, what + ": confidence");
        assertArrayEquals(expected.edge, actual.edge, what + ": edge");
        assertArrayEquals(expected.normalX, actual.normalX, what + ": normalX");
        assertArrayEquals(expected.normalY, actual.normalY, what + ": normalY");
        assertEquals(expected.globalU, actual.globalU, what + ": globalU");
        assertEquals(expected.globalV, actual.globalV, what + ": globalV");
    }
}
