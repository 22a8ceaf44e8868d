package wayward.flow;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.lang.management.ManagementFactory;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The fill's vector kernel must change nothing but the time: the flow it gives is the point-by-point fill's to the
 * bit, on the object-motion benchmark's scenes (movers over still ground, real photographs from Debian's
 * opencv-doc, noise) and on pictures whose grid rows are not a multiple of the vector's lanes. The flow itself is
 * checked against analytic truth and OpenCV elsewhere ({@link ObjectMotionTest}, {@link OpenCvReferenceTest}).
 */
class VectorFillTest {
    @Test
    void theTestsRunTheVectorKernel() {
        // the build starts the test JVM with --add-modules jdk.incubator.vector (pom.xml); without it every test
        // here would compare the point-by-point fill with itself
        assertTrue(FillKernel.vectorLanes() > 0, "the test JVM lacks jdk.incubator.vector");
        assertTrue(FlowEstimator.instructions().contains("vector instructions ("), FlowEstimator.instructions());
    }

    @Test
    void objectScenesGiveTheSameFlowToTheBit() {
        List<ObjectMotionCase> cases = ObjectMotionBench.cases(ObjectMotionBench.Half.TUNE, 11);
        assertTrue(cases.size() >= 20, "cases: " + cases.size());
        int w = ObjectMotionCase.WIDTH;
        int h = ObjectMotionCase.HEIGHT;
        try (GridLucasKanadeFlow points = new GridLucasKanadeFlow(w, h, FlowSettings.defaults(), FillKernel.POINTS);
                GridLucasKanadeFlow vector = new GridLucasKanadeFlow(w, h, FlowSettings.defaults(), new VectorFill())) {
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
                try (GridLucasKanadeFlow points = new GridLucasKanadeFlow(wh[0], wh[1], s, FillKernel.POINTS);
                        GridLucasKanadeFlow vector = new GridLucasKanadeFlow(wh[0], wh[1], s, new VectorFill())) {
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
        try (GridLucasKanadeFlow flow = new GridLucasKanadeFlow(320, 240, FlowSettings.defaults(), new VectorFill())) {
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
