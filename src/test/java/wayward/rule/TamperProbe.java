package wayward.rule;

import java.nio.ByteBuffer;
import java.time.Clock;
import org.bytedeco.ffmpeg.global.avutil;
import org.bytedeco.javacv.FFmpegFrameGrabber;
import org.bytedeco.javacv.Frame;
import wayward.flow.FlowConfig;
import wayward.event.Event;
import wayward.flow.FlowEstimator;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;

/** Prints the tamper watch's figures over a video, for tuning: {@code TamperProbe VIDEO [fps]}. */
public final class TamperProbe {
    private TamperProbe() {
    }

    public static void main(String[] args) throws Exception {
        try (FFmpegFrameGrabber g = new FFmpegFrameGrabber(args[0])) {
            g.setPixelFormat(avutil.AV_PIX_FMT_GRAY8);
            g.setImageWidth(320); // downscaled by swscale's area filter, as the service does
            g.setImageHeight(180);
            g.setImageScalingFlags(org.bytedeco.ffmpeg.global.swscale.SWS_AREA);
            g.start();
            double fps = g.getFrameRate();
            FlowEstimator flow = FlowEstimator.create(320, 180, FlowConfig.DEFAULTS.toSettings());
            FlowField field = flow.newField();
            TamperWatch w = new TamperWatch("probe", Clock.systemUTC());
            GrayFrame f = new GrayFrame(320, 180);
            Frame frame;
            int i = 0;
            while ((frame = g.grabImage()) != null) {
                ByteBuffer b = (ByteBuffer) frame.image[0];
                for (int y = 0; y < frame.imageHeight; y++) {
                    b.position(y * frame.imageStride);
                    b.get(f.pixels, y * frame.imageWidth, frame.imageWidth);
                }
                double t = i++ / fps;
                if (flow.push(f.pixels, field)) {
                    w.update(f, field, t);
                }
                for (Event e; (e = w.poll()) != null; ) {
                    System.out.println("EVENT " + e.kind().jsonName() + " " + e.phase().jsonName() + " " + t);
                }
                if (i % 15 == 0) {
                    TamperWatch.Figures x = w.figures();
                    System.out.printf("t=%.1f spread=%.2f base=%.2f ratio=%.3f base=%.3f shift=%.2f baseStill=%.3f stillness=%.2f%n", t,
                            x.spread(), x.baseSpread(), x.ratio(), x.baseRatio(), x.shift(), x.baseStill(), x.stillness());
                }
            }
        }
    }
}
