package wayward.flow;

/**
 * Pyramidal Lucas–Kanade flow solved on a regular grid of points and interpolated to every pixel (sparse to
 * dense). At each grid point of each level, coarse to fine, one displacement is found for the square window
 * around it by Gauss–Newton iterations with the gradients of the earlier frame (the inverse compositional form
 * for a translation, Baker &amp; Matthews 2004), started from the coarser level's result (Bouguet 2000). Within
 * the window the brightness difference is taken about its mean, so a change of light between frames does not
 * read as motion (the offset is solved for and eliminated). The confidence is the smallest eigenvalue of the
 * window's mean-free structure tensor (Shi &amp; Tomasi 1994). Iterations stop early once a step is below
 * 1/20 pixel. After each level the grid is smoothed, each point weighted by its confidence, so points on flat
 * ground or straight edges (where a window alone cannot tell the motion) take their textured neighbours'
 * motion. The pyramid is low-passed before each halving so fine texture does not alias on coarse levels.
 *
 * <p>The work per frame is about (pixels / stride²) × window area × iterations, instead of pixels × window
 * area. The result is the grid itself ({@link FlowField} with this stride); {@link FlowField#toDense()}
 * interpolates it to every pixel where a picture needs it. All buffers are sized in the constructor; {@link #compute} and {@link #push} allocate nothing.
 * With {@code threads > 1} each level's grid rows are split into bands solved in parallel on a small pool
 * owned by this instance ({@link #close()} stops it). Not thread-safe otherwise: one instance per analysis
 * thread. No I/O, no logging.
 */
public final class GridLucasKanadeFlow extends PyramidFlowEstimator {
    /** A step below this (pixels², squared length) ends the iterations of a point. */
    private static final float CONVERGED_STEP2 = 2.5e-3f;

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
    /** The finest level's mean-free structure tensor per grid point (a, b, c of [[a, b], [b, c]]). */
    private final float[] tensorA;
    private final float[] tensorB;
    private final float[] tensorC;
    // per level: where each grid column / row of this level falls on the next coarser level's grid
    private final int[][] initCol;
    private final float[][] initColWeight;
    private final int[][] initRow;
    private final float[][] initRowWeight;
    private final Band[] bands;
    private final float[] pyramidScratch;
    private final GlobalMotion globalMotion;
    private final float[][] smoothU;
    private final float[][] smoothV;
    private final float[] smoothC;
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
        super(width, height, settings.stride());
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
        tensorA = new float[gridU[0].length];
        tensorB = new float[gridU[0].length];
        tensorC = new float[gridU[0].length];
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
        pyramidScratch = new float[height * Math.max(1, width / 2)];
        globalMotion = new GlobalMotion(gridU[0].length);
        smoothU = new float[levelCount][];
        smoothV = new float[levelCount][];
        for (int l = 0; l < levelCount; l++) {
            smoothU[l] = new float[gridU[l].length];
            smoothV[l] = new float[gridV[l].length];
        }
        int largestGrid = 0;
        for (float[] g : gridU) {
            largestGrid = Math.max(largestGrid, g.length);
        }
        smoothC = new float[largestGrid];
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

    // what the band workers do next, and on what (written before each pool run, read by the workers)
    private static final int SOLVE = 0;
    private static final int PYRAMID_ROWS = 1;
    private static final int PYRAMID_COLUMNS = 2;
    private static final int SMOOTH_ROWS = 3;
    private static final int SMOOTH_COLUMNS = 4;
    private int phase;
    private int currentLevel;
    private byte[] pendingFrame;
    private float[][] pendingPyramid;

    /**
     * The smoothed pyramid of a frame. With bands, level 0 and its halving (most of the work) are split by rows;
     * the small coarse levels are halved on this thread.
     */
    @Override
    void buildPyramid(byte[] frame, float[][] pyramid) {
        if (pool == null || levelCount == 1) {
            Pyramids.buildSmooth(frame, pyramid, levelWidth, levelHeight, pyramidScratch);
            return;
        }
        pendingFrame = frame;
        pendingPyramid = pyramid;
        phase = PYRAMID_ROWS;
        pool.runAll();
        phase = PYRAMID_COLUMNS;
        pool.runAll();
        for (int l = 2; l < levelCount; l++) {
            Pyramids.halveSmooth(pyramid[l - 1], levelWidth[l - 1], levelHeight[l - 1], pyramid[l], levelWidth[l],
                    levelHeight[l], pyramidScratch);
        }
        pendingFrame = null;
        pendingPyramid = null;
    }

    @Override
    void estimate(FlowField out) {
        for (int l = levelCount - 1; l >= 0; l--) {
            currentLevel = l;
            // bands only where there is enough work to share: hand-over costs more than a small coarse level
            boolean shared = pool != null && gridWidth[l] * gridHeight[l] >= MIN_SHARED_POINTS;
            if (shared) {
                phase = SOLVE;
                pool.runAll();
            } else {
                solveRows(l, 0, gridHeight[l], bands[0]);
            }
            for (int pass = 0; pass < SMOOTH_PASSES; pass++) {
                if (shared) {
                    phase = SMOOTH_ROWS;
                    pool.runAll();
                    phase = SMOOTH_COLUMNS;
                    pool.runAll();
                } else {
                    smoothRows(l, 0, gridHeight[l]);
                    smoothColumns(l, 0, gridHeight[l]);
                }
            }
        }
        System.arraycopy(gridU[0], 0, out.u, 0, out.u.length);
        System.arraycopy(gridV[0], 0, out.v, 0, out.v.length);
        for (int g = 0; g < out.u.length; g++) {
            out.setTensor(g, tensorA[g], tensorB[g], tensorC[g]);
        }
        globalMotion.measure(out);
    }

    /** Band worker entry: band {@code b} of {@code count} does its share of rows of the current phase. */
    private void solveBand(int b, int count) {
        int l = currentLevel;
        switch (phase) {
            case SOLVE:
                solveRows(l, gridHeight[l] * b / count, gridHeight[l] * (b + 1) / count, bands[b]);
                break;
            case PYRAMID_ROWS: {
                int h = levelHeight[0];
                int y0 = h * b / count;
                int y1 = h * (b + 1) / count;
                Pyramids.convertRows(pendingFrame, pendingPyramid[0], levelWidth[0], y0, y1);
                Pyramids.smoothRows(pendingPyramid[0], levelWidth[0], pyramidScratch, levelWidth[1], y0, y1);
                break;
            }
            case PYRAMID_COLUMNS: {
                int h = levelHeight[1];
                Pyramids.smoothColumns(pyramidScratch, levelHeight[0], pendingPyramid[1], levelWidth[1],
                        h * b / count, h * (b + 1) / count);
                break;
            }
            case SMOOTH_ROWS:
                smoothRows(l, gridHeight[l] * b / count, gridHeight[l] * (b + 1) / count);
                break;
            default:
                smoothColumns(l, gridHeight[l] * b / count, gridHeight[l] * (b + 1) / count);
                break;
        }
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

    /**
     * Solves one window; writes flow and confidence of grid point g. The first pass over the window loads the
     * template (values, gradients, structure tensor) and, where the window warped by the starting flow lies
     * inside the picture, the first residuals too, so a single-step solve reads each pixel once.
     */
    private void solvePoint(float[] i0, float[] i1, int w, int h, int cx, int cy, float u0, float v0, Band band,
            float[] gu, float[] gv, float[] gc, int g, boolean finest) {
        final int r = radius;
        final int n = windowPixels;
        final float[] t = band.t;
        final float[] gx = band.gx;
        final float[] gy = band.gy;
        final float maxX = w - 1;
        final float maxY = h - 1;
        float sx = 0f;
        float sy = 0f;
        float sxx = 0f;
        float sxy = 0f;
        float syy = 0f;
        float sd = 0f;
        float sxd = 0f;
        float syd = 0f;
        boolean firstResidualsDone = false;
        int k = 0;
        // where the window lands in the later frame with the starting flow
        float fx0 = cx + u0;
        float fy0 = cy + v0;
        fx0 = fx0 < 0f ? 0f : (fx0 > maxX ? maxX : fx0);
        fy0 = fy0 < 0f ? 0f : (fy0 > maxY ? maxY : fy0);
        final int wx0 = (int) fx0;
        final int wy0 = (int) fy0;
        if (cx - r >= 1 && cy - r >= 1 && cx + r + 1 < w && cy + r + 1 < h) {
            if (wx0 - r >= 0 && wy0 - r >= 0 && wx0 + r + 1 < w && wy0 + r + 1 < h) {
                final float ax = fx0 - wx0;
                final float ay = fy0 - wy0;
                final float w00 = (1f - ax) * (1f - ay);
                final float w01 = ax * (1f - ay);
                final float w10 = (1f - ax) * ay;
                final float w11 = ax * ay;
                final int shift = (wy0 - cy) * w + (wx0 - cx);
                // a single step (the finest level's default) uses these residuals only: nothing to keep
                final boolean keep = !finest || finestIterations > 1;
                for (int dy = -r; dy <= r; dy++) {
                    final int row = (cy + dy) * w + cx;
                    for (int dx = -r; dx <= r; dx++) {
                        final int p = row + dx;
                        final float ix = 0.5f * (i0[p + 1] - i0[p - 1]);
                        final float iy = 0.5f * (i0[p + w] - i0[p - w]);
                        final float tv = i0[p];
                        final int q = p + shift;
                        final float d = w00 * i1[q] + w01 * i1[q + 1] + w10 * i1[q + w] + w11 * i1[q + w + 1] - tv;
                        if (keep) {
                            t[k] = tv;
                            gx[k] = ix;
                            gy[k] = iy;
                        }
                        sx += ix;
                        sy += iy;
                        sxx += ix * ix;
                        sxy += ix * iy;
                        syy += iy * iy;
                        sd += d;
                        sxd += ix * d;
                        syd += iy * d;
                        k++;
                    }
                }
                firstResidualsDone = true;
            } else {
                for (int dy = -r; dy <= r; dy++) {
                    final int row = (cy + dy) * w + cx;
                    for (int dx = -r; dx <= r; dx++) {
                        final int p = row + dx;
                        final float ix = 0.5f * (i0[p + 1] - i0[p - 1]);
                        final float iy = 0.5f * (i0[p + w] - i0[p - w]);
                        t[k] = i0[p];
                        gx[k] = ix;
                        gy[k] = iy;
                        sx += ix;
                        sy += iy;
                        sxx += ix * ix;
                        sxy += ix * iy;
                        syy += iy * iy;
                        k++;
                    }
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
                    final float ix = 0.5f * (i0[row + clamp(x + 1, w)] - i0[row + clamp(x - 1, w)]);
                    final float iy = 0.5f * (i0[down + x] - i0[up + x]);
                    t[k] = i0[row + x];
                    gx[k] = ix;
                    gy[k] = iy;
                    sx += ix;
                    sy += iy;
                    sxx += ix * ix;
                    sxy += ix * iy;
                    syy += iy * iy;
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
        if (finest) {
            tensorA[g] = cxx * invN;
            tensorB[g] = cxy * invN;
            tensorC[g] = cyy * invN;
        }
        final float a = cxx + lambda;
        final float c = cyy + lambda;
        final float det = a * c - cxy * cxy;
        float u = u0;
        float v = v0;
        if (det > 1e-3f) {
            final float ia = c / det;
            final float ib = -cxy / det;
            final float ic = a / det;
            final int maxIterations = finest ? finestIterations : iterations;
            for (int it = 0; it < maxIterations; it++) {
                if (it > 0 || !firstResidualsDone) {
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
                    sd = 0f;
                    sxd = 0f;
                    syd = 0f;
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

    /**
     * Passes of the confidence-weighted grid smoothing after each level, and the weight of a point's own value
     * against each neighbour's. Chosen on the OpenCV comparison suite (DEVELOPERS.md): 3 passes with self
     * weight 3 filled flat areas best (suite mean EPE 0.136 px; 2: 0.138, 4: 0.141).
     */
    static final int SMOOTH_PASSES = 3;
    /** Grid points a level needs before its rows are split into bands. */
    static final int MIN_SHARED_POINTS = 1024;
    static final float SELF_WEIGHT = 3f;

    /**
     * Confidence-weighted 3×3 mean of a level's grid: points on flat ground or edges (no confidence) take the
     * motion of their textured neighbours; textured points keep most of their own.
     */
    /** First half of a smoothing pass: horizontal 3-sums of c, c·u, c·v for grid rows [j0, j1). */
    private void smoothRows(int l, int j0, int j1) {
        final int gw = gridWidth[l];
        final float[] u = gridU[l];
        final float[] v = gridV[l];
        final float[] c = gridConfidence[l];
        final float[] hc = smoothC;
        final float[] hu = smoothU[l];
        final float[] hv = smoothV[l];
        for (int j = j0; j < j1; j++) {
            final int row = j * gw;
            float cPrev = 0f;
            float uPrev = 0f;
            float vPrev = 0f;
            float cHere = c[row];
            float uHere = cHere * u[row];
            float vHere = cHere * v[row];
            for (int i = 0; i < gw; i++) {
                float cNext = 0f;
                float uNext = 0f;
                float vNext = 0f;
                if (i + 1 < gw) {
                    cNext = c[row + i + 1];
                    uNext = cNext * u[row + i + 1];
                    vNext = cNext * v[row + i + 1];
                }
                hc[row + i] = cPrev + cHere + cNext;
                hu[row + i] = uPrev + uHere + uNext;
                hv[row + i] = vPrev + vHere + vNext;
                cPrev = cHere;
                uPrev = uHere;
                vPrev = vHere;
                cHere = cNext;
                uHere = uNext;
                vHere = vNext;
            }
        }
    }

    /**
     * Second half: vertical 3-sums of the row sums and the weighted mean for grid rows [j0, j1), written back
     * into the grid. Each row reads only its own point's old value, so bands may write back at once.
     */
    private void smoothColumns(int l, int j0, int j1) {
        final int gw = gridWidth[l];
        final int gh = gridHeight[l];
        final float[] u = gridU[l];
        final float[] v = gridV[l];
        final float[] c = gridConfidence[l];
        final float[] hc = smoothC;
        final float[] hu = smoothU[l];
        final float[] hv = smoothV[l];
        final float self = SELF_WEIGHT;
        for (int j = j0; j < j1; j++) {
            final int row = j * gw;
            final int up = j > 0 ? row - gw : -1;
            final int down = j + 1 < gh ? row + gw : -1;
            for (int i = 0; i < gw; i++) {
                final int k = row + i;
                float sc = hc[k];
                float su = hu[k];
                float sv = hv[k];
                if (up >= 0) {
                    sc += hc[up + i];
                    su += hu[up + i];
                    sv += hv[up + i];
                }
                if (down >= 0) {
                    sc += hc[down + i];
                    su += hu[down + i];
                    sv += hv[down + i];
                }
                final float ws = self * c[k];
                final float norm = 1f / (ws + sc + 1e-3f);
                u[k] = (ws * u[k] + su + 1e-3f * u[k]) * norm;
                v[k] = (ws * v[k] + sv + 1e-3f * v[k]) * norm;
            }
        }
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
