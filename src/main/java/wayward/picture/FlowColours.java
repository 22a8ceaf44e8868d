package wayward.picture;

import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.image.BufferedImage;
import wayward.flow.FlowField;

/**
 * Flow pictures in the colour coding of Baker et al. (2011, the Middlebury flow benchmark): hue gives the
 * direction, saturation the speed relative to the largest in the picture; white is no motion. The wheel has 55
 * hues in six ramps (red–yellow 15, yellow–green 6, green–cyan 4, cyan–blue 11, blue–magenta 13, magenta–red 6),
 * as in their published colour code; values from memory of that code.
 */
public final class FlowColours {
    private static final int[][] WHEEL = wheel();

    private FlowColours() {
    }

    private static int[][] wheel() {
        int ry = 15;
        int yg = 6;
        int gc = 4;
        int cb = 11;
        int bm = 13;
        int mr = 6;
        int[][] w = new int[ry + yg + gc + cb + bm + mr][3];
        int k = 0;
        for (int i = 0; i < ry; i++, k++) {
            w[k] = new int[] {255, 255 * i / ry, 0};
        }
        for (int i = 0; i < yg; i++, k++) {
            w[k] = new int[] {255 - 255 * i / yg, 255, 0};
        }
        for (int i = 0; i < gc; i++, k++) {
            w[k] = new int[] {0, 255, 255 * i / gc};
        }
        for (int i = 0; i < cb; i++, k++) {
            w[k] = new int[] {0, 255 - 255 * i / cb, 255};
        }
        for (int i = 0; i < bm; i++, k++) {
            w[k] = new int[] {255 * i / bm, 0, 255};
        }
        for (int i = 0; i < mr; i++, k++) {
            w[k] = new int[] {255, 0, 255 - 255 * i / mr};
        }
        return w;
    }

    /** RGB of a displacement already divided by the picture's largest speed (so |(fx, fy)| ≤ 1 inside). */
    public static int rgb(double fx, double fy) {
        double rad = Math.sqrt(fx * fx + fy * fy);
        double a = Math.atan2(-fy, -fx) / Math.PI;
        double fk = (a + 1) / 2 * (WHEEL.length - 1);
        int k0 = (int) Math.floor(fk);
        int k1 = (k0 + 1) % WHEEL.length;
        double f = fk - k0;
        int out = 0;
        for (int c = 0; c < 3; c++) {
            double col = ((1 - f) * WHEEL[k0][c] + f * WHEEL[k1][c]) / 255.0;
            col = rad <= 1 ? 1 - rad * (1 - col) : col * 0.75;
            out = (out << 8) | (int) Math.floor(255 * col);
        }
        return out;
    }

    /**
     * The colour wheel as a legend: a disc of the given radius (picture {@code 2 * radius + 1} square, transparent
     * outside the disc) where each point shows the colour of the motion from the centre to it, the rim being the
     * largest speed. Allocates the picture.
     */
    public static BufferedImage wheel(int radius) {
        if (radius < 1) {
            throw new IllegalArgumentException("radius: " + radius + " (expected: at least 1)");
        }
        int d = 2 * radius + 1;
        BufferedImage w = new BufferedImage(d, d, BufferedImage.TYPE_INT_ARGB);
        for (int y = 0; y < d; y++) {
            for (int x = 0; x < d; x++) {
                double fx = (x - radius) / (double) radius;
                double fy = (y - radius) / (double) radius;
                if (fx * fx + fy * fy <= 1) {
                    w.setRGB(x, y, 0xff000000 | rgb(fx, fy));
                }
            }
        }
        return w;
    }

    /** Largest speed in the field, pixels per frame pair (at least a tiny positive number). */
    public static double maxSpeed(FlowField f) {
        double m = 1e-6;
        for (int i = 0; i < f.u.length; i++) {
            m = Math.max(m, Math.hypot(f.u[i], f.v[i]));
        }
        return m;
    }

    /**
     * The field (interpolated to every pixel) coloured by direction and speed, with a legend to its right: the
     * colour wheel itself (a disc where each point shows the colour of the motion from its centre to it, the rim
     * being the largest speed) and, where the JDK has a font, the speed of the rim in pixels per frame.
     */
    public static BufferedImage picture(FlowField field) {
        FlowField f = field.toDense();
        double max = maxSpeed(f);
        int legend = Math.max(64, Math.min(160, f.height));
        // below the wheel, two lines of text: the rim's speed and its unit
        BufferedImage img = new BufferedImage(f.width + legend, Math.max(f.height, legend + 14),
                BufferedImage.TYPE_INT_RGB);
        for (int y = 0; y < img.getHeight(); y++) {
            for (int x = 0; x < img.getWidth(); x++) {
                img.setRGB(x, y, 0xffffff);
            }
        }
        for (int y = 0; y < f.height; y++) {
            for (int x = 0; x < f.width; x++) {
                int i = y * f.width + x;
                img.setRGB(x, y, rgb(f.u[i] / max, f.v[i] / max));
            }
        }
        int r = legend / 2 - 8;
        int cx = f.width + legend / 2;
        int cy = legend / 2;
        for (int y = -r; y <= r; y++) {
            for (int x = -r; x <= r; x++) {
                if (x * x + y * y <= r * r) {
                    img.setRGB(cx + x, cy + y, rgb((double) x / r, (double) y / r));
                }
            }
        }
        try {
            Graphics2D g = img.createGraphics();
            g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
            g.setColor(Color.BLACK);
            g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 11));
            g.drawString(String.format(java.util.Locale.ROOT, "rim = %.2f px", max), f.width + 6, legend - 2);
            g.drawString("per frame", f.width + 6, legend + 11);
            g.dispose();
        } catch (Throwable noFonts) {
            // a headless JDK without fonts: the wheel alone is the legend; the scale is printed by the command
        }
        return img;
    }
}
