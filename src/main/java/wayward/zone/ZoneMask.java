package wayward.zone;

import java.util.Arrays;

/**
 * The pixels of a picture that lie inside a polygon. The polygon is given in fractions of the frame (0..1, x to
 * the right, y down), so one zone fits every resolution; a pixel belongs to the zone when its centre lies inside
 * (even–odd rule). Made once per resolution; immutable.
 */
public final class ZoneMask {
    public final int width;
    public final int height;
    private final int[] pixels;

    private ZoneMask(int width, int height, int[] pixels) {
        this.width = width;
        this.height = height;
        this.pixels = pixels;
    }

    /**
     * @param xs polygon corners, x as a fraction of the width; read, not kept
     * @param ys polygon corners, y as a fraction of the height; same length as xs, at least 3
     */
    public static ZoneMask rasterise(double[] xs, double[] ys, int width, int height) {
        if (xs.length != ys.length || xs.length < 3) {
            throw new IllegalArgumentException("polygon: " + xs.length + " x and " + ys.length
                    + " y values (expected the same number, at least 3)");
        }
        if (width < 1 || height < 1) {
            throw new IllegalArgumentException("size: " + width + "x" + height + " (expected at least 1x1)");
        }
        int n = xs.length;
        double[] px = new double[n];
        double[] py = new double[n];
        for (int i = 0; i < n; i++) {
            px[i] = xs[i] * width;
            py[i] = ys[i] * height;
        }
        int[] inside = new int[width * height];
        int count = 0;
        double[] crossings = new double[n];
        for (int y = 0; y < height; y++) {
            double cy = y + 0.5;
            int c = 0;
            for (int i = 0, j = n - 1; i < n; j = i++) {
                // half-open rule on y so a vertex on the scan line is counted once
                if ((py[i] > cy) != (py[j] > cy)) {
                    crossings[c++] = px[j] + (cy - py[j]) * (px[i] - px[j]) / (py[i] - py[j]);
                }
            }
            Arrays.sort(crossings, 0, c);
            for (int k = 0; k + 1 < c; k += 2) {
                // pixel centres x + 0.5 with crossings[k] < x + 0.5 < crossings[k + 1]
                int x0 = (int) Math.max(0, Math.floor(crossings[k] - 0.5) + 1);
                int x1 = (int) Math.min(width - 1, Math.ceil(crossings[k + 1] - 0.5) - 1);
                for (int x = x0; x <= x1; x++) {
                    inside[count++] = y * width + x;
                }
            }
        }
        return new ZoneMask(width, height, Arrays.copyOf(inside, count));
    }

    /** Number of pixels inside. */
    public int size() {
        return pixels.length;
    }

    /** Row-major index (y·width + x) of the k-th pixel inside, in increasing order. */
    public int pixel(int k) {
        return pixels[k];
    }

    public boolean contains(int x, int y) {
        return x >= 0 && y >= 0 && x < width && y < height && Arrays.binarySearch(pixels, y * width + x) >= 0;
    }

    /** The inside pixels' indices; shared, do not modify. For the meters' loops. */
    int[] indices() {
        return pixels;
    }
}
