package wayward.analysis;

import wayward.flow.FlowField;
import wayward.image.GrayFrame;

/** Receives every analysed frame with its flow, after the zone readings (analysis thread; annotated replay). */
@FunctionalInterface
public interface FrameListener {
    void frame(CameraStatus camera, GrayFrame frame, FlowField field, double streamSeconds);
}
