package wayward.picture;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import javax.imageio.ImageIO;
import org.bytedeco.javacv.FFmpegFrameGrabber;
import org.bytedeco.javacv.Frame;
import org.bytedeco.javacv.Java2DFrameConverter;
import wayward.flow.FlowEstimator;
import wayward.flow.FlowField;
import wayward.flow.FlowSettings;

/**
 * The {@code flow} command's work: the flow between two pictures (or two consecutive frames of a video), at the
 * pictures' own resolution, written as a Middlebury .flo file and a colour-wheel PNG.
 */
public final class FlowTool {
    private FlowTool() {
    }

    /** Gray picture as 8-bit luma (BT.601 weights, common practice) plus its size. */
    public record Gray(byte[] pixels, int width, int height) {
    }

    public static Gray gray(BufferedImage img) {
        int w = img.getWidth();
        int h = img.getHeight();
        byte[] p = new byte[w * h];
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                int rgb = img.getRGB(x, y);
                double luma = 0.299 * ((rgb >> 16) & 0xff) + 0.587 * ((rgb >> 8) & 0xff) + 0.114 * (rgb & 0xff);
                p[y * w + x] = (byte) Math.min(255, (int) Math.round(luma));
            }
        }
        return new Gray(p, w, h);
    }

    /** Reads a picture ImageIO understands (PNG, JPEG, BMP, GIF). */
    public static Gray readPicture(Path file) throws IOException {
        BufferedImage img = ImageIO.read(file.toFile());
        if (img == null) {
            throw new IOException(file + ": not a picture this program reads (expected PNG, JPEG, BMP or GIF)");
        }
        return gray(img);
    }

    /** The frame at or after {@code seconds} and the one after it. */
    public static Gray[] readVideoPair(Path file, double seconds) throws IOException {
        // FFmpeg's own chatter (stream dumps, option notes) only at error level
        org.bytedeco.ffmpeg.global.avutil.av_log_set_level(org.bytedeco.ffmpeg.global.avutil.AV_LOG_ERROR);
        try (FFmpegFrameGrabber g = new FFmpegFrameGrabber(file.toFile());
                Java2DFrameConverter convert = new Java2DFrameConverter()) {
            g.setVideoOption("threads", "1");
            g.start();
            if (seconds > 0) {
                g.setTimestamp((long) (seconds * 1_000_000L));
            }
            Gray[] pair = new Gray[2];
            for (int k = 0; k < 2; k++) {
                Frame f = g.grabImage();
                if (f == null) {
                    throw new IOException(file + ": no frame " + (k == 0 ? "at" : "after the one at") + " " + seconds + " s");
                }
                pair[k] = gray(convert.convert(f));
            }
            g.stop();
            return pair;
        }
    }

    /** Estimates the flow from a to b with the default settings at their size. */
    public static FlowField estimate(Gray a, Gray b) {
        if (a.width() != b.width() || a.height() != b.height()) {
            throw new IllegalArgumentException("pictures: " + a.width() + "x" + a.height() + " and " + b.width() + "x"
                    + b.height() + " (expected the same size)");
        }
        FlowEstimator e = FlowEstimator.create(a.width(), a.height(), FlowSettings.defaults());
        return e.computeDense(a.pixels(), b.pixels());
    }

    /** Writes OUT.flo and the picture; returns the largest speed (the legend's rim), pixels per frame pair. */
    public static double write(FlowField f, Path flo, Path png) throws IOException {
        FloFile.write(f, flo);
        if (!ImageIO.write(FlowColours.picture(f), "png", png.toFile())) {
            throw new IOException(png + ": no PNG writer in this JDK");
        }
        return FlowColours.maxSpeed(f);
    }
}
