package wayward.flow;

/**
 * Pyramidal Lucas–Kanade flow solved on a regular grid of points and interpolated to every pixel (sparse to
 * dense). At each grid point of each level, coarse to fine, one displacement is found for the square window
 * around it by Gauss–Newton iterations with the gradients of the earlier frame (the inverse compositional form
 * for a translation, Baker &amp; Matthews 2004), started from the coarser level's result (Bouguet 2000). Within
 * the window the brightness difference is taken about its mean, so a change of light between frames does not
 * read as motion (the offset is solved for and eliminated). The confidence is the smallest eigenvalue of the
 * window's mean-free structure tensor (Shi &amp; Tomasi 1994). Iterations stop early once a step is below
 * 1/100 pixel.
 *
 * <p>The work per frame is about (pixels / stride²) × window area × iterations, instead of pixels × window
 * area. The result is the grid itself ({@link FlowField} with this stride); {@link FlowField#toDense()}
 * interpolates it to every pixel where a picture needs it. All buffers are sized in the constructor; {@link #compute} and {@link #push} allocate nothing.
 * With {@code threads > 1} each level's grid rows are split into bands solved in parallel on a small pool
 * owned by this instance ({@link #close()} stops it). Not thread-safe otherwise: one instance per analysis
 * thread. No I/O, no logging.
 */
public final class GridLucasKanadeFlow implements FlowEstimator, AutoCloseable {
    /** A step below this (pixels², squared length) ends the iterations of a point. */
    private static final float CONVERGED_STEP2 = 2.5e-3f;

    private final int width;
    private final int height;
    private final int levelCount;
    private final int iterations;
    private final int finestIterations;
    private final int radius;
    private final int side;
    private final int windowPixels;
    private final float lambda;
    private final int stride;
    /** Grid spacing per level, in that level's pixels. */
    private final int[] levelStride;
    private final int[] levelWidth;
    private final int[] levelHeight;
    private final int[] gridWidth;
    private final int[] gridHeight;
    private final float[][] gridU;
    private final float[][] gridV;
    private final float[][] gridConfidence;
    // per level: where each grid column / row of this level falls on the next coarser level's grid
    private final int[][] initCol;
    private final float[][] initColWeight;
    private final int[][] initRow;
    private final float[][] initRowWeight;
    private float[][] earlier;
    private float[][] later;
    private boolean hasEarlier;
    private final Band[] bands;
    private final BandPool pool;

    /** Scratch of one band: the template window of the point being solved. */
    static final class Band {
        final float[] t;
        final float[] gx;
        final float[] gy;

        Band(int n) {
            t = new float[n];
            gx = new float[n];
            gy = new float[n];
        }
    }

    public GridLucasKanadeFlow(int width, int height, FlowSettings settings) {
        if (width < 1 || height < 1) {
            throw new IllegalArgumentException("size: " + width + "x" + height + " (expected at least 1x1)");
        }
        this.width = width;
        this.height = height;
        this.levelCount = settings.levelsFor(width, height);
        this.iterations = settings.iterations();
        this.finestIterations = settings.finestIterations();
        this.radius = settings.windowRadius();
        this.side = 2 * radius + 1;
        this.windowPixels = side * side;
        this.lambda = settings.regularization() * windowPixels;
        this.stride = settings.stride();
        levelStride = new int[levelCount];
        for (int l = 0; l < levelCount; l++) {
            levelStride[l] = l == 0 ? stride : settings.coarseStride();
        }
        levelWidth = new int[levelCount];
        levelHeight = new int[levelCount];
        gridWidth = new int[levelCount];
        gridHeight = new int[levelCount];
        gridU = new float[levelCount][];
        gridV = new float[levelCount][];
        gridConfidence = new float[levelCount][];
        earlier = new float[levelCount][];
        later = new float[levelCount][];
        int w = width;
        int h = height;
        for (int l = 0; l < levelCount; l++) {
            levelWidth[l] = w;
            levelHeight[l] = h;
            gridWidth[l] = FlowField.samples(w, levelStride[l]);
            gridHeight[l] = FlowField.samples(h, levelStride[l]);
            int g = gridWidth[l] * gridHeight[l];
            gridU[l] = new float[g];
            gridV[l] = new float[g];
            gridConfidence[l] = new float[g];
            earlier[l] = new float[w * h];
            later[l] = new float[w * h];
            w = Math.max(1, w / 2);
            h = Math.max(1, h / 2);
        }
        initCol = new int[levelCount][];
        initColWeight = new float[levelCount][];
        initRow = new int[levelCount][];
        initRowWeight = new float[levelCount][];
        for (int l = 0; l + 1 < levelCount; l++) {
            initCol[l] = new int[gridWidth[l]];
            initColWeight[l] = new float[gridWidth[l]];
            initRow[l] = new int[gridHeight[l]];
            initRowWeight[l] = new float[gridHeight[l]];
            coarseTable(l, gridWidth[l], levelWidth[l], levelWidth[l + 1], gridWidth[l + 1], initCol[l], initColWeight[l]);
            coarseTable(l, gridHeight[l], levelHeight[l], levelHeight[l + 1], gridHeight[l + 1], initRow[l], initRowWeight[l]);
        }
        int threads = Math.max(1, Math.min(settings.threads(), gridHeight[0]));
        bands = new Band[threads];
        for (int i = 0; i < threads; i++) {
            bands[i] = new Band(windowPixels);
        }
        pool = threads > 1 ? new BandPool(threads, this::solveBand) : null;
    }

    private int centre(int l, int index, int size) {
        int s = levelStride[l];
        return Math.min(size - 1, s / 2 + index * s);
    }

    /** For each grid index on a fine level: the lower coarse grid index and the weight of the upper one. */
    private void coarseTable(int l, int cells, int fineSize, int coarseSize, int coarseCells, int[] index,
            float[] weight) {
        float scale = (float) coarseSize / fineSize;
        int cs = levelStride[l + 1];
        for (int i = 0; i < cells; i++) {
            // pixel centre on the fine level, in coarse pixel coordinates, then in coarse grid coordinates
            float p = (centre(l, i, fineSize) + 0.5f) * scale - 0.5f;
            float g = (p - cs / 2) / cs;
            g = g < 0 ? 0 : Math.min(g, coarseCells - 1);
            int g0 = Math.min((int) g, Math.max(0, coarseCells - 2));
            index[i] = g0;
            weight[i] = coarseCells > 1 ? g - g0 : 0f;
        }
    }

    @Override
    public FlowField newField() {
        return new FlowField(width, height, stride);
    }

    @Override
    public int levelCount() {
        return levelCount;
    }

    /** Grid columns and rows of the finest level (for tests and status). */
    public int gridWidth() {
        return gridWidth[0];
    }

    public int gridHeight() {
        return gridHeight[0];
    }

    @Override
    public void compute(byte[] first, byte[] second, FlowField out) {
        check(first, "first");
        check(second, "second");
        checkField(out);
        Pyramids.build(first, earlier, levelWidth, levelHeight);
        Pyramids.build(second, later, levelWidth, levelHeight);
        estimate(out);
        hasEarlier = false;
    }

    @Override
    public boolean push(byte[] frame, FlowField out) {
        check(frame, "frame");
        checkField(out);
        Pyramids.build(frame, later, levelWidth, levelHeight);
        boolean estimated = false;
        if (hasEarlier) {
            estimate(out);
            estimated = true;
        }
        float[][] t = earlier;
        earlier = later;
        later = t;
        hasEarlier = true;
        return estimated;
    }

    @Override
    public void reset() {
        hasEarlier = false;
    }

    private void check(byte[] frame, String name) {
        if (frame.length != width * height) {
            throw new IllegalArgumentException(name + ": " + frame.length + " pixels (expected "
                    + width + "x" + height + " = " + width * height + ")");
        }
    }

    private void checkField(FlowField out) {
        if (out.imageWidth != width || out.imageHeight != height || out.stride != stride) {
            throw new IllegalArgumentException("out: " + out.imageWidth + "x" + out.imageHeight + " every "
                    + out.stride + " px (expected " + width + "x" + height + " every " + stride + " px)");
        }
    }

    // level being solved, read by the band workers
    private int currentLevel;

    private void estimate(FlowField out) {
        for (int l = levelCount - 1; l >= 0; l--) {
            currentLevel = l;
            if (pool == null) {
                solveRows(l, 0, gridHeight[l], bands[0]);
            } else {
                pool.runAll();
            }
        }
        System.arraycopy(gridU[0], 0, out.u, 0, out.u.length);
        System.arraycopy(gridV[0], 0, out.v, 0, out.v.length);
        System.arraycopy(gridConfidence[0], 0, out.confidence, 0, out.confidence.length);
    }

    /** Band worker entry: band {@code b} of {@code count} solves its share of the current level's rows. */
    private void solveBand(int b, int count) {
        int l = currentLevel;
        int rows = gridHeight[l];
        solveRows(l, rows * b / count, rows * (b + 1) / count, bands[b]);
    }

    private void solveRows(int l, int rowFrom, int rowTo, Band band) {
        final int w = levelWidth[l];
        final int h = levelHeight[l];
        final int gw = gridWidth[l];
        final float[] i0 = earlier[l];
        final float[] i1 = later[l];
        final float[] gu = gridU[l];
        final float[] gv = gridV[l];
        final float[] gc = gridConfidence[l];
        final boolean coarsest = l == levelCount - 1;
        final float[] cu = coarsest ? null : gridU[l + 1];
        final float[] cv = coarsest ? null : gridV[l + 1];
        final int cgw = coarsest ? 0 : gridWidth[l + 1];
        final float scaleX = coarsest ? 0f : (float) w / levelWidth[l + 1];
        final float scaleY = coarsest ? 0f : (float) h / levelHeight[l + 1];
        for (int j = rowFrom; j < rowTo; j++) {
            final int cy = centre(l, j, h);
            int r0 = 0;
            int r1 = 0;
            float wy = 0f;
            if (!coarsest) {
                r0 = initRow[l][j] * cgw;
                r1 = (initRowWeight[l][j] > 0f ? initRow[l][j] + 1 : initRow[l][j]) * cgw;
                wy = initRowWeight[l][j];
            }
            for (int i = 0; i < gw; i++) {
                final int cx = centre(l, i, w);
                float u0 = 0f;
                float v0 = 0f;
                if (!coarsest) {
                    final int c0 = initCol[l][i];
                    final int c1 = initColWeight[l][i] > 0f ? c0 + 1 : c0;
                    final float wx = initColWeight[l][i];
                    final float top = cu[r0 + c0] + wx * (cu[r0 + c1] - cu[r0 + c0]);
                    final float bottom = cu[r1 + c0] + wx * (cu[r1 + c1] - cu[r1 + c0]);
                    u0 = scaleX * (top + wy * (bottom - top));
                    final float topV = cv[r0 + c0] + wx * (cv[r0 + c1] - cv[r0 + c0]);
                    final float bottomV = cv[r1 + c0] + wx * (cv[r1 + c1] - cv[r1 + c0]);
                    v0 = scaleY * (topV + wy * (bottomV - topV));
                }
                final int g = j * gw + i;
                solvePoint(i0, i1, w, h, cx, cy, u0, v0, band, gu, gv, gc, g, l == 0);
            }
        }
    }

    /** Solves one window; writes flow and confidence of grid point g. */
    private void solvePoint(float[] i0, float[] i1, int w, int h, int cx, int cy, float u0, float v0, Band band,
            float[] gu, float[] gv, float[] gc, int g, boolean finest) {
        final int r = radius;
        final int n = windowPixels;
        final float[] t = band.t;
        final float[] gx = band.gx;
        final float[] gy = band.gy;
        float sx = 0f;
        float sy = 0f;
        float sxx = 0f;
        float sxy = 0f;
        float syy = 0f;
        int k = 0;
        if (cx - r >= 1 && cy - r >= 1 && cx + r + 1 < w && cy + r + 1 < h) {
            for (int dy = -r; dy <= r; dy++) {
                final int row = (cy + dy) * w + cx;
                for (int dx = -r; dx <= r; dx++) {
                    final int p = row + dx;
                    final float ax = 0.5f * (i0[p + 1] - i0[p - 1]);
                    final float ay = 0.5f * (i0[p + w] - i0[p - w]);
                    t[k] = i0[p];
                    gx[k] = ax;
                    gy[k] = ay;
                    sx += ax;
                    sy += ay;
                    sxx += ax * ax;
                    sxy += ax * ay;
                    syy += ay * ay;
                    k++;
                }
            }
        } else {
            for (int dy = -r; dy <= r; dy++) {
                final int y = clamp(cy + dy, h);
                final int up = clamp(y - 1, h) * w;
                final int down = clamp(y + 1, h) * w;
                final int row = y * w;
                for (int dx = -r; dx <= r; dx++) {
                    final int x = clamp(cx + dx, w);
                    final float ax = 0.5f * (i0[row + clamp(x + 1, w)] - i0[row + clamp(x - 1, w)]);
                    final float ay = 0.5f * (i0[down + x] - i0[up + x]);
                    t[k] = i0[row + x];
                    gx[k] = ax;
                    gy[k] = ay;
                    sx += ax;
                    sy += ay;
                    sxx += ax * ax;
                    sxy += ax * ay;
                    syy += ay * ay;
                    k++;
                }
            }
        }
        final float invN = 1f / n;
        // mean-free structure tensor: the brightness offset between the frames is an extra unknown, eliminated
        final float cxx = sxx - sx * sx * invN;
        final float cxy = sxy - sx * sy * invN;
        final float cyy = syy - sy * sy * invN;
        final float half = 0.5f * (cxx - cyy) * invN;
        final float e = 0.5f * (cxx + cyy) * invN - (float) Math.sqrt(half * half + cxy * cxy * invN * invN);
        gc[g] = e > 0f ? e : 0f;
        final float a = cxx + lambda;
        final float c = cyy + lambda;
        final float det = a * c - cxy * cxy;
        float u = u0;
        float v = v0;
        if (det > 1e-3f) {
            final float ia = c / det;
            final float ib = -cxy / det;
            final float ic = a / det;
            final float maxX = w - 1;
            final float maxY = h - 1;
            final int maxIterations = finest ? finestIterations : iterations;
            for (int it = 0; it < maxIterations; it++) {
                float fx = cx + u;
                float fy = cy + v;
                fx = fx < 0f ? 0f : (fx > maxX ? maxX : fx);
                fy = fy < 0f ? 0f : (fy > maxY ? maxY : fy);
                final int ix = (int) fx;
                final int iy = (int) fy;
                final float ax = fx - ix;
                final float ay = fy - iy;
                final float w00 = (1f - ax) * (1f - ay);
                final float w01 = ax * (1f - ay);
                final float w10 = (1f - ax) * ay;
                final float w11 = ax * ay;
                float sd = 0f;
                float sxd = 0f;
                float syd = 0f;
                k = 0;
                if (ix - r >= 0 && iy - r >= 0 && ix + r + 1 < w && iy + r + 1 < h) {
                    for (int dy = -r; dy <= r; dy++) {
                        final int p0 = (iy + dy) * w + ix - r;
                        final int p1 = p0 + w;
                        for (int dx = 0; dx < side; dx++) {
                            final float warped = w00 * i1[p0 + dx] + w01 * i1[p0 + dx + 1]
                                    + w10 * i1[p1 + dx] + w11 * i1[p1 + dx + 1];
                            final float d = warped - t[k];
                            sd += d;
                            sxd += gx[k] * d;
                            syd += gy[k] * d;
                            k++;
                        }
                    }
                } else {
                    for (int dy = -r; dy <= r; dy++) {
                        final int y0 = clamp(iy + dy, h) * w;
                        final int y1 = clamp(iy + dy + 1, h) * w;
                        for (int dx = -r; dx <= r; dx++) {
                            final int x0 = clamp(ix + dx, w);
                            final int x1 = clamp(ix + dx + 1, w);
                            final float warped = w00 * i1[y0 + x0] + w01 * i1[y0 + x1] + w10 * i1[y1 + x0] + w11 * i1[y1 + x1];
                            final float d = warped - t[k];
                            sd += d;
                            sxd += gx[k] * d;
                            syd += gy[k] * d;
                            k++;
                        }
                    }
                }
                final float bx = sxd - sx * sd * invN;
                final float by = syd - sy * sd * invN;
                final float du = -(ia * bx + ib * by);
                final float dv = -(ib * bx + ic * by);
                u += du;
                v += dv;
                if (du * du + dv * dv < CONVERGED_STEP2) {
                    break;
                }
            }
        }
        gu[g] = u;
        gv[g] = v;
    }

    private static int clamp(int i, int size) {
        return i < 0 ? 0 : (i >= size ? size - 1 : i);
    }

    /** Stops the band threads, if any. */
    @Override
    public void close() {
        if (pool != null) {
            pool.close();
        }
    }
}
