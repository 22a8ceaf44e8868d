package wayward.flow;

import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Cost of one flow estimate (one frame pair) at analysis sizes, single thread. Run on demand, see
 * DEVELOPERS.md ("Benchmarks"); add {@code -prof gc} for allocation per frame.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class FlowBenchmark {
    @Param({"160x120", "320x240", "640x360"})
    public String size;

    @Param({"3"})
    public int iterations;

    @Param({"1", "4"})
    public int stride;

    @Param({"1"})
    public int finest;

    private FlowEstimator flow;
    private FlowField field;
    private byte[] a;
    private byte[] b;
    private boolean odd;

    @Setup
    public void setUp() {
        String[] wh = size.split("x");
        int w = Integer.parseInt(wh[0]);
        int h = Integer.parseInt(wh[1]);
        // a smooth random texture moved by (1.5, -0.7) px: the kernel's cost does not depend on content much
        SplittableRandom r = new SplittableRandom(1);
        double[][] waves = new double[12][4];
        for (double[] wv : waves) {
            double wl = 6 + r.nextDouble() * 34;
            double ang = r.nextDouble() * Math.PI;
            wv[0] = Math.cos(ang) / wl;
            wv[1] = Math.sin(ang) / wl;
            wv[2] = r.nextDouble() * 2 * Math.PI;
            wv[3] = 6 + r.nextDouble() * 6;
        }
        a = render(w, h, 0, 0, waves);
        b = render(w, h, 1.5, -0.7, waves);
        flow = FlowEstimator.create(w, h, FlowSettings.defaults().withStride(stride, 2 * stride).withIterations(iterations, finest));
        field = flow.newField();
        flow.push(a, field);
    }

    private static byte[] render(int w, int h, double sx, double sy, double[][] waves) {
        byte[] out = new byte[w * h];
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double s = 128;
                for (double[] wv : waves) {
                    s += wv[3] * Math.sin(2 * Math.PI * (wv[0] * (x - sx) + wv[1] * (y - sy)) + wv[2]);
                }
                out[y * w + x] = (byte) Math.max(0, Math.min(255, Math.round(s)));
            }
        }
        return out;
    }

    /** One frame into the stream: pyramid of the new frame plus the estimate against the previous one. */
    @Benchmark
    public FlowField push() {
        odd = !odd;
        flow.push(odd ? b : a, field);
        return field;
    }
}
