package wayward.flow;

import static org.bytedeco.opencv.global.opencv_core.CV_8UC1;

import java.nio.FloatBuffer;
import org.bytedeco.opencv.global.opencv_core;
import org.bytedeco.opencv.global.opencv_video;
import org.bytedeco.opencv.opencv_core.Mat;
import org.bytedeco.opencv.opencv_video.DISOpticalFlow;

/** OpenCV's dense flow methods through JavaCV (test scope only): the reference implementations. */
final class OpenCvFlow {
    static {
        opencv_core.setNumThreads(1);
    }

    private OpenCvFlow() {
    }

    static Mat gray(byte[] pixels, int w, int h) {
        Mat m = new Mat(h, w, CV_8UC1);
        m.data().put(pixels, 0, pixels.length);
        return m;
    }

    /** OpenCV DIS (Kroeger et al. 2016) with one of its presets; a fresh instance so no state carries over. */
    static FlowField dis(int preset, byte[] a, byte[] b, int w, int h) {
        try (DISOpticalFlow dis = DISOpticalFlow.create(preset); Mat ma = gray(a, w, h); Mat mb = gray(b, w, h);
                Mat flow = new Mat()) {
            dis.calc(ma, mb, flow);
            return toField(flow, w, h);
        }
    }

    /** OpenCV Farnebäck (2003) with the parameters of the reference table (0.5, 3, 15, 3, 5, 1.2). */
    static FlowField farneback(byte[] a, byte[] b, int w, int h) {
        try (Mat ma = gray(a, w, h); Mat mb = gray(b, w, h); Mat flow = new Mat()) {
            opencv_video.calcOpticalFlowFarneback(ma, mb, flow, 0.5, 3, 15, 3, 5, 1.2, 0);
            return toField(flow, w, h);
        }
    }

    static FlowField toField(Mat flow, int w, int h) {
        FlowField f = new FlowField(w, h);
        FloatBuffer fb = flow.createBuffer();
        for (int i = 0; i < w * h; i++) {
            f.u[i] = fb.get(2 * i);
            f.v[i] = fb.get(2 * i + 1);
        }
        return f;
    }

}
