package wayward.zone;

import java.util.Arrays;

/**
 * The sample points of a flow field that lie inside a polygon. The polygon is given in fractions of the frame
 * (0..1, x to the right, y down), so one zone fits every resolution; a sample belongs to the zone when the centre
 * of its pixel lies inside (even–odd rule). With stride 1 every pixel is a sample. Made once per resolution;
 * immutable. {@link #width} and {@link #height} count samples, like {@link wayward.flow.FlowField}.
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
        return rasterise(xs, ys, width, height, 1);
    }

    /** The mask of a flow field sampled every {@code stride} pixels over a picture of the given size. */
    public static ZoneMask rasterise(double[] xs, double[] ys, wayward.flow.FlowField field) {
        return rasterise(xs, ys, field.imageWidth, field.imageHeight, field.stride);
    }

    private static ZoneMask rasterise(double[] xs, double[] ys, int width, int height, int stride) {
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
        int gw = wayward.flow.FlowField.samples(width, stride);
        int gh = wayward.flow.FlowField.samples(height, stride);
        int[] inside = new int[gw * gh];
        int count = 0;
        double[] crossings = new double[n];
        for (int j = 0; j < gh; j++) {
            double cy = Math.min(height - 1, stride / 2 + j * stride) + 0.5;
            int c = 0;
            for (int a = 0, b = n - 1; a < n; b = a++) {
                // half-open rule on y so a vertex on the scan line is counted once
                if ((py[a] > cy) != (py[b] > cy)) {
                    crossings[c++] = px[b] + (cy - py[b]) * (px[a] - px[b]) / (py[a] - py[b]);
                }
            }
            Arrays.sort(crossings, 0, c);
            for (int i = 0, k = 0; i < gw; i++) {
                double cx = Math.min(width - 1, stride / 2 + i * stride) + 0.5;
                while (k < c && crossings[k] < cx) {
                    k++;
                }
                // an odd number of crossings left of the centre: inside
                if ((k & 1) == 1 && k < c && cx < crossings[k]) {
                    inside[count++] = j * gw + i;
                }
            }
        }
        return new ZoneMask(gw, gh, Arrays.copyOf(inside, count));
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
