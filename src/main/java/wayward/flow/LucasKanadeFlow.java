package wayward.flow;

import java.util.Arrays;

/**
 * Dense optical flow by the Lucas–Kanade method (Lucas &amp; Kanade 1981): brightness constancy, small motion
 * and one displacement per small window, solved by least squares at every pixel, coarse to fine over an image
 * pyramid with warping (Bouguet's pyramidal scheme, 2000).
 *
 * <p>Per level the structure tensor G of the earlier frame is summed over the window once; each iteration warps
 * the later frame by the current flow, and solves (G + λI) u = Σ ∇I (∇I·u<sub>j</sub> − I<sub>t</sub>) + λu, where
 * every window pixel j contributes its own linearisation around its own current flow. That form converges where
 * the textbook increment step, with pixels warped by different flows, can drift. Window sums are running box
 * sums, so the cost per pixel does not depend on the window size.
 *
 * <p>All buffers are sized in the constructor for one frame size; {@link #compute} and {@link #push} allocate
 * nothing. Not thread-safe: one instance per analysis thread. No I/O, no logging.
 */
public final class LucasKanadeFlow extends PyramidFlowEstimator {
    private final int levelCount;
    private final int iterations;
    private final int radius;
    private final float lambda;
    private final Level[] levels;

    private static final class Level {
        final int w;
        final int h;
        final float[] ix;
        final float[] iy;
        final float[] gxx;
        final float[] gxy;
        final float[] gyy;
        final float[] u;
        final float[] v;
        final float[] px;
        final float[] py;
        final float[] bx;
        final float[] by;

        Level(int w, int h) {
            this.w = w;
            this.h = h;
            int n = w * h;
            ix = new float[n];
            iy = new float[n];
            gxx = new float[n];
            gxy = new float[n];
            gyy = new float[n];
            u = new float[n];
            v = new float[n];
            px = new float[n];
            py = new float[n];
            bx = new float[n];
            by = new float[n];
        }
    }

    /** Scratch of the box sums, sized for level 0 and shared by all levels. */
    private final int[] levelWidths;
    private final int[] levelHeights;
    private final float[] rowSums;
    private final GlobalMotion globalMotion;
    private final float[] columnAccumulator;

    public LucasKanadeFlow(int width, int height, FlowSettings settings) {
        super(width, height, 1);
        this.levelCount = settings.levelsFor(width, height);
        this.iterations = settings.iterations();
        this.radius = settings.windowRadius();
        int side = 2 * radius + 1;
        this.lambda = settings.regularization() * side * side;
        this.levels = new Level[levelCount];
        this.earlier = new float[levelCount][];
        this.later = new float[levelCount][];
        int w = width;
        int h = height;
        for (int l = 0; l < levelCount; l++) {
            levels[l] = new Level(w, h);
            earlier[l] = new float[w * h];
            later[l] = new float[w * h];
            w = Math.max(1, w / 2);
            h = Math.max(1, h / 2);
        }
        levelWidths = new int[levelCount];
        levelHeights = new int[levelCount];
        for (int l = 0; l < levelCount; l++) {
            levelWidths[l] = levels[l].w;
            levelHeights[l] = levels[l].h;
        }
        rowSums = new float[width * height];
        globalMotion = new GlobalMotion(width * height);
        columnAccumulator = new float[width];
    }

    @Override
    public int levelCount() {
        return levelCount;
    }

    @Override
    void buildPyramid(byte[] frame, float[][] pyramid) {
        Pyramids.build(frame, pyramid, levelWidths, levelHeights);
    }

    @Override
    void estimate(FlowField out) {
        for (int l = levelCount - 1; l >= 0; l--) {
            final Level lv = levels[l];
            gradients(earlier[l], lv.ix, lv.iy, lv.w, lv.h);
            structureTensor(lv);
            if (l == levelCount - 1) {
                Arrays.fill(lv.u, 0f);
                Arrays.fill(lv.v, 0f);
            } else {
                upsample(levels[l + 1], lv);
            }
            for (int it = 0; it < iterations; it++) {
                refine(lv, earlier[l], later[l]);
            }
        }
        final Level fine = levels[0];
        System.arraycopy(fine.u, 0, out.u, 0, fine.u.length);
        System.arraycopy(fine.v, 0, out.v, 0, fine.v.length);
        tensors(fine, out);
        globalMotion.measure(out);
    }

    /** Central differences, one-sided at the borders (clamped neighbours). */
    private static void gradients(float[] img, float[] ix, float[] iy, int w, int h) {
        for (int y = 0; y < h; y++) {
            final int row = y * w;
            final int up = (y > 0 ? y - 1 : 0) * w;
            final int down = (y < h - 1 ? y + 1 : h - 1) * w;
            for (int x = 0; x < w; x++) {
                final int left = x > 0 ? x - 1 : 0;
                final int right = x < w - 1 ? x + 1 : w - 1;
                ix[row + x] = 0.5f * (img[row + right] - img[row + left]);
                iy[row + x] = 0.5f * (img[down + x] - img[up + x]);
            }
        }
    }

    private void structureTensor(Level lv) {
        final int n = lv.w * lv.h;
        final float[] ix = lv.ix;
        final float[] iy = lv.iy;
        final float[] a = lv.px;
        final float[] b = lv.py;
        final float[] c = lv.bx;
        for (int i = 0; i < n; i++) {
            final float gx = ix[i];
            final float gy = iy[i];
            a[i] = gx * gx;
            b[i] = gx * gy;
            c[i] = gy * gy;
        }
        boxSum(a, lv.gxx, lv.w, lv.h);
        boxSum(b, lv.gxy, lv.w, lv.h);
        boxSum(c, lv.gyy, lv.w, lv.h);
    }

    /** Bilinear upsampling of the coarser level's flow, scaled by the size ratio. */
    private static void upsample(Level coarse, Level fine) {
        final int cw = coarse.w;
        final int ch = coarse.h;
        final float sx = (float) fine.w / cw;
        final float sy = (float) fine.h / ch;
        final float[] cu = coarse.u;
        final float[] cv = coarse.v;
        for (int y = 0; y < fine.h; y++) {
            float fy = (y + 0.5f) / sy - 0.5f;
            fy = fy < 0f ? 0f : Math.min(fy, ch - 1);
            final int y0 = (int) fy;
            final int y1 = Math.min(y0 + 1, ch - 1);
            final float ay = fy - y0;
            final int r0 = y0 * cw;
            final int r1 = y1 * cw;
            final int out = y * fine.w;
            for (int x = 0; x < fine.w; x++) {
                float fx = (x + 0.5f) / sx - 0.5f;
                fx = fx < 0f ? 0f : Math.min(fx, cw - 1);
                final int x0 = (int) fx;
                final int x1 = Math.min(x0 + 1, cw - 1);
                final float ax = fx - x0;
                final float w00 = (1f - ax) * (1f - ay);
                final float w01 = ax * (1f - ay);
                final float w10 = (1f - ax) * ay;
                final float w11 = ax * ay;
                fine.u[out + x] = sx * (w00 * cu[r0 + x0] + w01 * cu[r0 + x1] + w10 * cu[r1 + x0] + w11 * cu[r1 + x1]);
                fine.v[out + x] = sy * (w00 * cv[r0 + x0] + w01 * cv[r0 + x1] + w10 * cv[r1 + x0] + w11 * cv[r1 + x1]);
            }
        }
    }

    /** One warp–linearise–solve step on a level. */
    private void refine(Level lv, float[] i0, float[] i1) {
        final int w = lv.w;
        final int h = lv.h;
        final float maxX = w - 1;
        final float maxY = h - 1;
        final float[] u = lv.u;
        final float[] v = lv.v;
        final float[] ix = lv.ix;
        final float[] iy = lv.iy;
        final float[] px = lv.px;
        final float[] py = lv.py;
        for (int y = 0; y < h; y++) {
            final int row = y * w;
            for (int x = 0; x < w; x++) {
                final int i = row + x;
                float fx = x + u[i];
                float fy = y + v[i];
                fx = fx < 0f ? 0f : (fx > maxX ? maxX : fx);
                fy = fy < 0f ? 0f : (fy > maxY ? maxY : fy);
                final int x0 = (int) fx;
                final int y0 = (int) fy;
                final int x1 = x0 < w - 1 ? x0 + 1 : x0;
                final int y1 = y0 < h - 1 ? y0 + 1 : y0;
                final float ax = fx - x0;
                final float ay = fy - y0;
                final int r0 = y0 * w;
                final int r1 = y1 * w;
                final float top = i1[r0 + x0] + ax * (i1[r0 + x1] - i1[r0 + x0]);
                final float bottom = i1[r1 + x0] + ax * (i1[r1 + x1] - i1[r1 + x0]);
                final float warped = top + ay * (bottom - top);
                final float gx = ix[i];
                final float gy = iy[i];
                final float residual = gx * u[i] + gy * v[i] - (warped - i0[i]);
                px[i] = gx * residual;
                py[i] = gy * residual;
            }
        }
        boxSum(px, lv.bx, w, h);
        boxSum(py, lv.by, w, h);
        final float lam = lambda;
        final float[] gxx = lv.gxx;
        final float[] gxy = lv.gxy;
        final float[] gyy = lv.gyy;
        final float[] bx = lv.bx;
        final float[] by = lv.by;
        final int n = w * h;
        for (int i = 0; i < n; i++) {
            final float a = gxx[i] + lam;
            final float b = gxy[i];
            final float c = gyy[i] + lam;
            final float det = a * c - b * b;
            if (det > 1e-6f) {
                final float rx = bx[i] + lam * u[i];
                final float ry = by[i] + lam * v[i];
                u[i] = (c * rx - b * ry) / det;
                v[i] = (a * ry - b * rx) / det;
            }
        }
    }

    private void tensors(Level lv, FlowField out) {
        final int side = 2 * radius + 1;
        final float norm = 1f / (side * side);
        final int n = lv.w * lv.h;
        for (int i = 0; i < n; i++) {
            out.setTensor(i, lv.gxx[i] * norm, lv.gxy[i] * norm, lv.gyy[i] * norm);
        }
    }

    /**
     * Sum over the (2r+1)² window around every pixel, borders replicated. Running sums: a horizontal pass into
     * {@link #rowSums}, then a vertical pass that walks contiguous rows.
     */
    private void boxSum(float[] src, float[] dst, int w, int h) {
        boxSum(src, dst, w, h, radius, rowSums, columnAccumulator);
    }

    /**
     * Window sums with radius {@code r} and replicated borders. {@code rows} holds at least w·h floats and
     * {@code acc} at least w; both are scratch. Package-private for the reference test.
     */
    static void boxSum(float[] src, float[] dst, int w, int h, int r, float[] rows, float[] acc) {
        final int lastX = w - 1;
        for (int y = 0; y < h; y++) {
            final int row = y * w;
            float s = 0f;
            for (int k = -r; k <= r; k++) {
                s += src[row + (k < 0 ? 0 : (k > lastX ? lastX : k))];
            }
            rows[row] = s;
            for (int x = 1; x < w; x++) {
                final int add = x + r;
                final int sub = x - r - 1;
                s += src[row + (add > lastX ? lastX : add)] - src[row + (sub < 0 ? 0 : sub)];
                rows[row + x] = s;
            }
        }
        final int lastY = h - 1;
        Arrays.fill(acc, 0, w, 0f);
        for (int k = -r; k <= r; k++) {
            final int src0 = (k < 0 ? 0 : (k > lastY ? lastY : k)) * w;
            for (int x = 0; x < w; x++) {
                acc[x] += rows[src0 + x];
            }
        }
        System.arraycopy(acc, 0, dst, 0, w);
        for (int y = 1; y < h; y++) {
            final int add = y + r;
            final int sub = y - r - 1;
            final int addRow = (add > lastY ? lastY : add) * w;
            final int subRow = (sub < 0 ? 0 : sub) * w;
            final int out = y * w;
            for (int x = 0; x < w; x++) {
                final float s = acc[x] + rows[addRow + x] - rows[subRow + x];
                acc[x] = s;
                dst[out + x] = s;
            }
        }
    }
}
