package wayward.flow;

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

    @Param({"1"})
    public int threads;

    @Param({"2"})
    public int radius;

    /**
     * The grid flow's kernel ({@link FlowKernel}): "best" as the service picks it (the vector kernel where java runs
     * with {@code --add-modules jdk.incubator.vector}), "scalar" plain Java everywhere.
     */
    @Param({"best"})
    public String kernel;

    /** Grid spacing on the coarser levels; 0 = the default settings' own. */
    @Param({"0"})
    public int coarse;

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
        byte[][] ab = BenchFrames.pair(w, h);
        a = ab[0];
        b = ab[1];
        FlowSettings settings = FlowSettings.defaults().withStride(stride,
                coarse == 0 ? FlowSettings.defaults().coarseStride() : coarse).withIterations(iterations, finest)
                .withThreads(threads);
        flow = stride >= 2 && "scalar".equals(kernel) ? new GridLucasKanadeFlow(w, h, settings, FlowKernel.SCALAR)
                : FlowEstimator.create(w, h, settings);
        field = flow.newField();
        flow.push(a, field);
    }

    @org.openjdk.jmh.annotations.TearDown
    public void tearDown() {
        flow.close();
    }

    /** One frame into the stream: pyramid of the new frame plus the estimate against the previous one. */
    @Benchmark
    public FlowField push() {
        odd = !odd;
        flow.push(odd ? b : a, field);
        return field;
    }
}
