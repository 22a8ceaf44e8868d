package wayward.report;

import static org.bytedeco.ffmpeg.global.avutil.AV_PIX_FMT_YUV420P;

import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import org.bytedeco.javacv.FFmpegFrameRecorder;
import org.bytedeco.javacv.Java2DFrameConverter;
import wayward.clip.Snapshot;
import wayward.analysis.CameraConfig;
import wayward.analysis.ZoneConfig;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;
import wayward.picture.FlowColours;
import wayward.analysis.CameraStatus;
import wayward.analysis.FrameListener;
import wayward.analysis.ReadingListener;
import wayward.zone.ZoneReading;

/**
 * {@code replay --annotate OUT.mp4}: every analysed frame with the flow arrows in the Baker et al. colour
 * wheel, the zones, their headings and each rule's state, and the wheel itself as a legend, encoded as H.264
 * (the FFmpeg build's libopenh264) at the frames' own stream times. Analysis thread.
 */
public final class Annotator implements FrameListener, ReadingListener, AutoCloseable {
    private final Path out;
    private final double fps;
    private final Java2DFrameConverter converter = new Java2DFrameConverter();
    private FFmpegFrameRecorder recorder;
    private String[] states;
    private BufferedImage legend;
    private BufferedImage bgr;
    private long frames;

    public Annotator(Path out, double fps) {
        this.out = out;
        this.fps = fps;
    }

    @Override
    public void reading(CameraConfig camera, int zone, ZoneReading r, wayward.zone.Movers movers, String ruleState) {
        if (states == null) {
            states = new String[camera.zones().size()];
        }
        states[zone] = ruleState;
    }

    @Override
    public void frame(CameraStatus p, GrayFrame f, FlowField field, double t) {
        List<ZoneConfig> zones = p.config().zones();
        double[] headings = new double[zones.size()];
        for (int z = 0; z < zones.size(); z++) {
            headings[z] = p.zoneHeading(z);
        }
        BufferedImage img = Snapshot.live(f, field, ZoneConfig.xsOf(zones), ZoneConfig.ysOf(zones), headings,
                ZoneConfig.DEFAULT_MIN_SPEED / p.config().analysisFps());
        Graphics2D g = img.createGraphics();
        if (legend == null) {
            legend = FlowColours.wheel(48);
        }
        g.drawImage(legend, img.getWidth() - legend.getWidth() - 6, 6, null);
        g.setFont(new Font(Font.SANS_SERIF, Font.BOLD, 14));
        for (int z = 0; z < zones.size(); z++) {
            String state = states == null || states[z] == null ? "–" : states[z];
            String text = zones.get(z).id() + ": " + state;
            g.setColor(Color.BLACK);
            g.drawString(text, 9, 21 + 18 * z);
            g.setColor(state.equals("active") ? new Color(0xff4040) : state.equals("pending") ? Color.ORANGE : Color.WHITE);
            g.drawString(text, 8, 20 + 18 * z);
        }
        g.setColor(Color.WHITE);
        g.drawString(String.format(java.util.Locale.ROOT, "%.2f s", t), 8, img.getHeight() - 8);
        g.dispose();
        try {
            if (recorder == null) {
                recorder = new FFmpegFrameRecorder(out.toFile(), img.getWidth(), img.getHeight(), 0);
                recorder.setFormat("mp4");
                recorder.setVideoCodecName("libopenh264");
                recorder.setFrameRate(fps);
                recorder.setVideoBitrate(1_500_000);
                recorder.setPixelFormat(AV_PIX_FMT_YUV420P);
                recorder.setVideoOption("threads", "1");
                recorder.start();
            }
            long micros = Math.round(t * 1e6);
            if (micros > recorder.getTimestamp()) {
                recorder.setTimestamp(micros);
            }
            // the converter reads 3-byte BGR pictures as FFmpeg's bgr24; an int-RGB one would swap the colours
            if (bgr == null) {
                bgr = new BufferedImage(img.getWidth(), img.getHeight(), BufferedImage.TYPE_3BYTE_BGR);
            }
            Graphics2D c = bgr.createGraphics();
            c.drawImage(img, 0, 0, null);
            c.dispose();
            recorder.record(converter.convert(bgr));
            frames++;
        } catch (IOException e) {
            throw new java.io.UncheckedIOException("cannot write " + out, e);
        }
    }

    public long frames() {
        return frames;
    }

    @Override
    public void close() throws IOException {
        if (recorder != null) {
            recorder.stop();
            recorder.release();
        }
    }
}
