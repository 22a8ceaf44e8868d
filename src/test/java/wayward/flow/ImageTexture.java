package wayward.flow;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import javax.imageio.ImageIO;

/**
 * A real picture as a continuous texture: loaded (JDK ImageIO), turned to luma with the BT.601 weights
 * (common practice), shrunk by area means, and sampled between pixels with Catmull-Rom bicubic interpolation,
 * so pictures moved by any real displacement are exact with respect to that continuous model.
 */
final class ImageTexture {
    /** Debian's opencv-doc package ships these image pairs (Middlebury flow data and others). */
    static final Path DATA = Path.of("/usr/share/doc/opencv-doc/examples/data");

    private final double[] pixels;
    private final int w;
    private final int h;

    private ImageTexture(double[] pixels, int w, int h) {
        this.pixels = pixels;
        this.w = w;
        this.h = h;
    }

    /** Loads a picture and shrinks it by an integer factor (area mean). */
    static ImageTexture load(Path file, int shrink) throws IOException {
        BufferedImage img = ImageIO.read(file.toFile());
        if (img == null) {
            throw new IOException(file + ": not a picture ImageIO reads");
        }
        int w = img.getWidth() / shrink;
        int h = img.getHeight() / shrink;
        double[] out = new double[w * h];
        for (int y = 0; y < h * shrink; y++) {
            for (int x = 0; x < w * shrink; x++) {
                int rgb = img.getRGB(x, y);
                double luma = 0.299 * ((rgb >> 16) & 0xff) + 0.587 * ((rgb >> 8) & 0xff) + 0.114 * (rgb & 0xff);
                out[(y / shrink) * w + x / shrink] += luma / (shrink * shrink);
            }
        }
        return new ImageTexture(out, w, h);
    }

    int width() {
        return w;
    }

    int height() {
        return h;
    }

    /** Catmull-Rom bicubic value at a real position (borders replicated). */
    double at(double x, double y) {
        int x0 = (int) Math.floor(x);
        int y0 = (int) Math.floor(y);
        double fx = x - x0;
        double fy = y - y0;
        double sum = 0;
        for (int j = -1; j <= 2; j++) {
            double wy = kernel(j - fy);
            int yy = Math.max(0, Math.min(h - 1, y0 + j));
            double row = 0;
            for (int i = -1; i <= 2; i++) {
                int xx = Math.max(0, Math.min(w - 1, x0 + i));
                row += kernel(i - fx) * pixels[yy * w + xx];
            }
            sum += wy * row;
        }
        return sum;
    }

    /** Catmull-Rom cubic convolution kernel (a = −0.5; Keys 1981). */
    private static double kernel(double t) {
        t = Math.abs(t);
        if (t < 1) {
            return 1.5 * t * t * t - 2.5 * t * t + 1;
        }
        if (t < 2) {
            return -0.5 * t * t * t + 2.5 * t * t - 4 * t + 2;
        }
        return 0;
    }
}
