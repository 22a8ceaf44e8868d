package wayward.flow;

import static org.bytedeco.opencv.global.opencv_core.CV_8UC1;

import java.util.concurrent.TimeUnit;
import org.bytedeco.opencv.global.opencv_core;
import org.bytedeco.opencv.global.opencv_video;
import org.bytedeco.opencv.opencv_core.Mat;
import org.bytedeco.opencv.opencv_video.DISOpticalFlow;
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
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;

/**
 * The reference implementations on the same frames as {@link FlowBenchmark}: OpenCV 4.13 through JavaCV, one
 * thread. Run in the same JMH invocation as ours to compare (see DEVELOPERS.md).
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class OpenCvFlowBenchmark {
    @Param({"160x120", "320x240", "640x360"})
    public String size;

    private Mat a;
    private Mat b;
    private DISOpticalFlow ultrafast;
    private DISOpticalFlow fast;
    private DISOpticalFlow medium;

    @Setup
    public void setUp() {
        opencv_core.setNumThreads(1);
        String[] wh = size.split("x");
        int w = Integer.parseInt(wh[0]);
        int h = Integer.parseInt(wh[1]);
        byte[][] ab = BenchFrames.pair(w, h);
        a = new Mat(h, w, CV_8UC1);
        a.data().put(ab[0], 0, ab[0].length);
        b = new Mat(h, w, CV_8UC1);
        b.data().put(ab[1], 0, ab[1].length);
        ultrafast = DISOpticalFlow.create(DISOpticalFlow.PRESET_ULTRAFAST);
        fast = DISOpticalFlow.create(DISOpticalFlow.PRESET_FAST);
        medium = DISOpticalFlow.create(DISOpticalFlow.PRESET_MEDIUM);
    }

    @TearDown
    public void tearDown() {
        a.close();
        b.close();
        ultrafast.close();
        fast.close();
        medium.close();
    }

    private static Mat dis(DISOpticalFlow d, Mat a, Mat b) {
        // a fresh output each call: DIS would otherwise start from its previous result
        Mat flow = new Mat();
        d.calc(a, b, flow);
        flow.close();
        return a;
    }

    @Benchmark
    public Mat disUltrafast() {
        return dis(ultrafast, a, b);
    }

    @Benchmark
    public Mat disFast() {
        return dis(fast, a, b);
    }

    @Benchmark
    public Mat disMedium() {
        return dis(medium, a, b);
    }

    @Benchmark
    public Mat farneback() {
        Mat flow = new Mat();
        opencv_video.calcOpticalFlowFarneback(a, b, flow, 0.5, 3, 15, 3, 5, 1.2, 0);
        flow.close();
        return a;
    }
}
