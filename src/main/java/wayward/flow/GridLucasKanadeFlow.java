package wayward.flow;

/**
 * Pyramidal Lucas–Kanade flow solved on a regular grid of points and interpolated to every pixel (sparse to
 * dense). At each grid point of each level, coarse to fine, one displacement is found for the square window
 * around it by Gauss–Newton iterations with the gradients of the earlier frame (the inverse compositional form
 * for a translation, Baker &amp; Matthews 2004), started from the coarser level's result (Bouguet 2000). Within
 * the window the brightness difference is taken about its mean, so a change of light between frames does not
 * read as motion (the offset is solved for and eliminated). The confidence is the smallest eigenvalue of the
 * window's mean-free structure tensor (Shi &amp; Tomasi 1994). A window its motion leaves badly explained (across
 * a motion boundary) is solved again with each pixel weighed by how alike its brightness is to the window's
 * centre ({@link #WINDOW_BRIGHTNESS}), and takes that motion where it explains the centre's side far better.
 * Iterations stop early once a step is below
 * 1/20 pixel. The pyramid is low-passed before each halving so fine texture does not alias on coarse levels.
 *
 * <p>Small movers over still ground. Where the coarser level's neighbours disagree (a motion boundary), a point
 * starts from whichever of them, their blend, or no motion explains its window best, instead of from a blend
 * that belongs to neither side. After each level a fill runs: a point with texture and a small residual keeps
 * its motion, averaged only with neighbours that move alike (so sensor noise is smoothed but a boundary is not
 * crossed); any other point (flat ground, a straight edge, a window across a boundary) takes the least-squares
 * motion of its own and its neighbours' structure tensors, each neighbour weighted by how alike the windows'
 * brightness is. An edge's tensor constrains only the motion across it, so an edge point keeps its own normal
 * motion and borrows the rest, and a plain surface framed by edges of several directions takes the full motion
 * of its rim; the support a filled point gathered passes on, weakened, to the next point inwards. Last, flat
 * ground that is not framed by moving outlines on (nearly) every side takes the background's motion
 * ({@link #settleFlat}): the fill cannot tell a plain roof from the plain yard beside it, what frames them can.
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
    /** Per level and grid point: the window's mean-free structure tensor [[a, b], [b, c]] per window pixel. */
    private final float[][] gridA;
    private final float[][] gridB;
    private final float[][] gridC;
    /**
     * Per level and grid point, during the fill: the support of the current motion, a tensor like the data's
     * (current and next pass, swapped like gridU/smoothU).
     */
    private final float[][] supportA;
    private final float[][] supportB;
    private final float[][] supportC;
    private final float[][] nextA;
    private final float[][] nextB;
    private final float[][] nextC;
    /** Per level and grid point: the window's residual after its last step, per pixel, grey levels². */
    private final float[][] gridResidual;
    /**
     * Per level and grid point: the window's mean brightness in the earlier frame, grey levels, which the fill
     * compares between neighbours; where the point's motion came from the weighed solve, the mean is weighed
     * alike ({@link #WINDOW_BRIGHTNESS}): the brightness of the side the motion belongs to.
     */
    private final float[][] gridMean;
    /**
     * Per grid point of the full-size level: the window's plain mean brightness, grey levels, for {@link #densify}'s
     * range kernel (a window across an outline sits between both sides, so ground pixels beside a mover lean
     * towards the ground's own points; the weighted mean would pull them to the outline's).
     */
    private final float[] windowMean;
    // per level: where each grid column / row of this level falls on the next coarser level's grid
    private final int[][] initCol;
    private final float[][] initColWeight;
    private final int[][] initRow;
    private final float[][] initRowWeight;
    private final Band[] bands;
    private final float[] pyramidScratch;
    /** Per finest grid point during {@link #settleFlat}: flat, still or moving. */
    private final byte[] settleScratch;
    /** Per pixel during {@link #densify}: flat, still or moving, then the sides' sum (see {@link #settlePixels}). */
    private final byte[] pixelKind;
    private final byte[] pixelSides;
    /** Whether the last pair's global motion was measured (see {@link GlobalMotion#measure}). */
    private boolean globalMeasured;
    /** Residuals of the search level's textured points, for their median. */
    private final float[] searchScratch;
    /** Scratch of the sampled median of {@link #searchScratch} (see {@link Quickselect#kth(float[], int, int, float[], float[])}). */
    private final float[] searchInside;
    private final float[] searchSample = new float[Quickselect.SAMPLE];
    /** The full-size search's lattice costs of one point, in the order they were tried. */
    private final float[] latticeCosts = new float[(FINE_SEARCH_RADIUS + 1) * (FINE_SEARCH_RADIUS + 1)];
    /**
     * How many times the reference size ({@link #REFERENCE_SIZE}) the picture is, rounded, at least 1
     * ({@link #sceneScale}). {@link #settleFlat} looks this many times {@link #SETTLE_REACH} grid points far, so
     * that it reaches as far into the scene at every resolution (the searches do so by searching on coarser levels
     * too: {@link #referenceLevel}).
     */
    private final int searchScale;
    /**
     * The level of about the reference size: 0 at the reference size, one level up per doubling of the picture
     * (rounded in the logarithm). Above 0, the full-size search searches again there.
     */
    private final int referenceLevel;
    /**
     * Level of the second coarse search on a larger picture: {@link #SEARCH_LEVEL} at the reference size (no second
     * one), one level up per doubling.
     */
    private final int coarseSearchLevel;
    private final GlobalMotion globalMotion;
    private final float[][] smoothU;
    private final float[][] smoothV;
    /**
     * The fill's brightness weight of each grid point of the level being filled for each of its
     * {@link #NEIGHBOURS} neighbours (in {@link #NEIGHBOUR_DI} order), neighbour n of point k at
     * {@code n × fillStride + k}. It depends only on the windows' means, which the fill does not change, so it is
     * worked out once per level instead of once per pass and per side.
     */
    private final float[] fillWeight;
    /** Points of the largest level's grid: the length of each neighbour's run in {@link #fillWeight}. */
    private final int fillStride;
    /** Per grid point of the level being filled: 1 where it keeps its own motion ({@link #keeps}), else 0. */
    private final float[] fillKept;
    /** What the fill pass under way reads and writes, for {@link #kernel}. */
    private final FillPass fillPass = new FillPass();
    /** Does the fill's inner loops and the full-size windows' sums: on vector instructions where the JVM has them. */
    private final FlowKernel kernel;
    /**
     * Per level: where each window pixel lies relative to the window's centre, in that level's row-major
     * index, in row order. Where a window lies inside the picture its pixels are read in one flat loop over this
     * table: C2 compiles it to markedly faster code than two nested loops of {@code 2 × radius + 1} steps, and
     * the sums run in the same order.
     */
    private final int[][] windowOffset;
    private final BandPool pool;

    /** Scratch of one band: the template window of the point being solved. */
    static final class Band {
        final float[] t;
        final float[] gx;
        final float[] gy;
        /** Each window pixel's weight: how alike its brightness is to the window's centre. */
        final float[] wt;

        /** The starts a point at a motion boundary compares ({@link #startCosts}): motion and window cost. */
        final float[] startU = new float[START_CANDIDATES];
        final float[] startV = new float[START_CANDIDATES];
        final float[] startCost = new float[START_CANDIDATES];
        final int[] startAt = new int[START_CANDIDATES];
        final float[] startWeights = new float[4 * START_CANDIDATES];

        /** {@link FlowKernel#windowSums}'s sums and scratch. */
        final float[] sums = new float[FlowKernel.SUMS_LENGTH];

        /** The full-size row being solved in single steps, and which of its points the row's steps solve. */
        final StepRow row;
        final boolean[] inRow;

        Band(int n, int points) {
            t = new float[n];
            gx = new float[n];
            gy = new float[n];
            wt = new float[n];
            row = new StepRow(points);
            inRow = new boolean[points];
        }
    }

    public GridLucasKanadeFlow(int width, int height, FlowSettings settings) {
        this(width, height, settings, FlowKernel.best());
    }

    /** With the innermost loops done by {@code kernel} (tests compare the variants). */
    GridLucasKanadeFlow(int width, int height, FlowSettings settings, FlowKernel kernel) {
        super(width, height, settings.stride());
        this.kernel = kernel;
        this.levelCount = settings.levelsFor(width, height);
        this.iterations = settings.iterations();
        this.finestIterations = settings.finestIterations();
        this.radius = settings.windowRadius();
        final int side = 2 * radius + 1;
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
        gridA = new float[levelCount][];
        gridB = new float[levelCount][];
        gridC = new float[levelCount][];
        gridMean = new float[levelCount][];
        windowMean = new float[width > 0 ? FlowField.samples(width, stride) * FlowField.samples(height, stride) : 0];
        gridResidual = new float[levelCount][];
        supportA = new float[levelCount][];
        supportB = new float[levelCount][];
        supportC = new float[levelCount][];
        nextA = new float[levelCount][];
        nextB = new float[levelCount][];
        nextC = new float[levelCount][];
        for (int l = 0; l < levelCount; l++) {
            gridA[l] = new float[gridU[l].length];
            gridB[l] = new float[gridU[l].length];
            gridC[l] = new float[gridU[l].length];
            gridMean[l] = new float[gridU[l].length];
            gridResidual[l] = new float[gridU[l].length];
            supportA[l] = new float[gridU[l].length];
            supportB[l] = new float[gridU[l].length];
            supportC[l] = new float[gridU[l].length];
            nextA[l] = new float[gridU[l].length];
            nextB[l] = new float[gridU[l].length];
            nextC[l] = new float[gridU[l].length];
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
        pyramidScratch = new float[height * Math.max(1, width / 2)];
        settleScratch = new byte[gridU[0].length];
        pixelKind = new byte[width * height];
        pixelSides = new byte[width * height];
        searchScratch = new float[gridU[0].length];
        searchInside = new float[searchScratch.length];
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
        fillStride = largestGrid;
        fillWeight = new float[NEIGHBOURS * largestGrid];
        fillKept = new float[largestGrid];
        windowOffset = new int[levelCount][windowPixels];
        for (int l = 0; l < levelCount; l++) {
            int k = 0;
            for (int dy = -radius; dy <= radius; dy++) {
                for (int dx = -radius; dx <= radius; dx++) {
                    windowOffset[l][k++] = dy * levelWidth[l] + dx;
                }
            }
        }
        int threads = Math.max(1, Math.min(settings.threads(), gridHeight[0]));
        bands = new Band[threads];
        for (int i = 0; i < threads; i++) {
            bands[i] = new Band(windowPixels, gridWidth[0]);
        }
        pool = threads > 1 ? new BandPool(threads, this::solveBand) : null;
        searchScale = sceneScale(width, height);
        referenceLevel = Math.min(levelCount - 1, (int) Math.round(Math.log(searchScale) / Math.log(2)));
        coarseSearchLevel = SEARCH_LEVEL + referenceLevel;
    }

    /**
     * How many times {@link #REFERENCE_SIZE} the picture's longer side is, rounded to a whole number, at least 1
     * (smaller pictures keep the reference reaches).
     */
    static int sceneScale(int width, int height) {
        return (int) Math.max(1, Math.round(Math.max(width, height) / (double) REFERENCE_SIZE));
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
            final int half = cs / 2; // as centre() places a level's points: whole pixels
            float g = (p - half) / cs;
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
    private static final int FILL = 3;
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
            if (l == 0 || ((l == SEARCH_LEVEL || l == coarseSearchLevel) && l + 1 < levelCount)) {
                searchLevel(l);
            }
            initSupport(l);
            fillWeights(l);
            for (int pass = 0; pass < FILL_PASSES; pass++) {
                preparePass(l);
                if (shared) {
                    phase = FILL;
                    pool.runAll();
                } else {
                    fillRows(l, 0, gridHeight[l]);
                }
                // the pass wrote the next values beside the current ones: they become the current ones
                swap(gridU, smoothU, l);
                swap(gridV, smoothV, l);
                swap(supportA, nextA, l);
                swap(supportB, nextB, l);
                swap(supportC, nextC, l);
            }
        }
        System.arraycopy(gridU[0], 0, out.u, 0, out.u.length);
        System.arraycopy(gridV[0], 0, out.v, 0, out.v.length);
        for (int g = 0; g < out.u.length; g++) {
            out.setTensor(g, gridA[0][g], gridB[0][g], gridC[0][g]);
        }
        globalMeasured = globalMotion.measure(out);
        settleFlat(out, globalMeasured, 1f);
    }

    /**
     * Larger eigenvalue of a point's tensor per window pixel, (grey levels per pixel)², from which a point that does
     * not keep its own motion in the fill is an outline (an edge) rather than flat ground: twice the fill's keep
     * level, above what sensor noise alone reaches in a 5×5 window.
     */
    static final float STRUCTURE = 8f;
    /**
     * Grid points a flat point looks along each axis for the structure that frames it (48 px at the reference size;
     * k times as many on a picture k times that size, {@link #sceneScale}, so that the inside of a mover as large in
     * the scene is reached: on the object-motion benchmark at twice the size, tune half, caught / object EPE / ring
     * EPE 0.839 / 1.539 / 0.459 with 12 points, 0.887 / 1.248 / 0.507 with 24).
     */
    static final int SETTLE_REACH = 12;
    /** Motion apart from the background's, pixels, from which a framing structure counts as moving. */
    static final float SETTLE_MOVING = 0.25f;
    /** Sides (of left, right, up, down) whose nearest structure must move for a flat point to be inside a mover. */
    static final int SETTLE_SIDES = 3;
    /**
     * Share of the picture's points with moving structure up to which, when too little of the picture is textured
     * for the global motion to be measured, the camera is taken for still: movers on still ground.
     */
    static final float SETTLE_MOVERS_SHARE = 0.1f;

    /**
     * Flat ground outside movers moves with the background. The fill hands a mover's motion to flat points on
     * both sides of its outline alike, and nothing in a flat window tells the two apart: a plain roof and the
     * plain yard around it look the same from inside. What tells them apart is what frames them. A flat point
     * inside a mover meets the mover's moving outline on (nearly) every side; a flat point beside it meets it on
     * one side and still structure, or none, on the others. So a point without structure of its own (neither
     * keeping its own motion in the fill nor an edge: larger eigenvalue under {@link #STRUCTURE}) looks along the
     * four axes for the nearest point with structure, up to
     * {@link #SETTLE_REACH} points away, and unless at least {@link #SETTLE_SIDES} of those move (apart from the
     * background's motion by {@link #SETTLE_MOVING} px or more), it takes the background's motion (the field's
     * global motion: zero for a fixed camera). Where the picture has texture enough to measure that motion, a
     * side without structure within reach tells nothing, and a point settles only when it also sees still
     * structure (in a turning or zooming picture the global motion is the median, not every point's, and flat
     * points by the picture's border see nothing on that side). Where too little of the picture is textured to
     * measure the global motion, the background is taken for still, and a side without structure for a still
     * side, only when at most {@link #SETTLE_MOVERS_SHARE} of the picture's points have moving structure (movers
     * on plain ground); otherwise (a camera moving over sparse texture looks the same from inside a flat patch)
     * nothing is settled.
     *
     * @param measured whether the field's global motion was measured (see {@link GlobalMotion#measure})
     * @param level    the keep, residual and structure levels' factor: 1 for the grid, the frame's noise
     *                 ({@link #noiseScale}) for {@link #computeDense}'s second settle
     */
    private void settleFlat(FlowField out, boolean measured, float level) {
        final int gw = gridWidth[0];
        final int gh = gridHeight[0];
        final float[] a = gridA[0];
        final float[] c = gridC[0];
        final float[] u = gridU[0];
        final float[] v = gridV[0];
        final byte[] frame = settleScratch;
        final float bu = out.globalU;
        final float bv = out.globalV;
        final float moving2 = SETTLE_MOVING * SETTLE_MOVING;
        int movingPoints = 0;
        final float[] conf = gridConfidence[0];
        final float[] res = gridResidual[0];
        final float keep = FILL_KEEP * level;
        final float keepResidual = FILL_RESIDUAL_KEEP * level;
        final float structure = STRUCTURE * level;
        for (int k = 0; k < frame.length; k++) {
            // no structure: the fill did not keep its own motion, and its larger eigenvalue (trace − smaller) is low;
            // worked out without branches (which points are flat is noise to the branch predictor)
            final boolean kept = (conf[k] >= keep) & (res[k] <= keepResidual);
            final boolean flat = !kept & (a[k] + c[k] - conf[k] < structure);
            final float du = u[k] - bu;
            final float dv = v[k] - bv;
            final int moves = !flat & (du * du + dv * dv >= moving2) ? 1 : 0;
            frame[k] = (byte) (flat ? FLAT : STILL + moves);
            movingPoints += moves;
        }
        if (!measured && movingPoints > SETTLE_MOVERS_SHARE * frame.length) {
            return;
        }
        final int reach = SETTLE_REACH * searchScale;
        for (int j = 0; j < gh; j++) {
            for (int i = 0; i < gw; i++) {
                final int k = j * gw + i;
                if (frame[k] != FLAT) {
                    continue;
                }
                // each side: 0 nothing within reach, 1 still structure, 8 moving structure
                final int sides = side(frame, k, -1, Math.min(i, reach))
                        + side(frame, k, 1, Math.min(gw - 1 - i, reach)) + side(frame, k, -gw, Math.min(j, reach))
                        + side(frame, k, gw, Math.min(gh - 1 - j, reach));
                final int moving = sides >> 3;
                final int still = sides & 7;
                if (moving < SETTLE_SIDES && (still > 0 || !measured)) {
                    out.u[k] = bu;
                    out.v[k] = bv;
                }
            }
        }
    }

    private static final byte FLAT = 0;
    private static final byte STILL = 1;
    private static final byte MOVING = 2;

    /**
     * The nearest point with structure from k in steps of {@code step} (at most {@code room} steps): 8 when it moves, 1
     * when it is still, 0 when there is none within reach (so four sides add up to moving × 8 + still).
     */
    private static int side(byte[] frame, int k, int step, int room) {
        int q = k;
        for (int m = 0; m < room; m++) {
            q += step;
            if (frame[q] != FLAT) {
                return frame[q] == MOVING ? 8 : 1;
            }
        }
        return 0;
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
                Pyramids.convertSmoothRows(pendingFrame, pendingPyramid[0], levelWidth[0], pyramidScratch,
                        levelWidth[1], y0, y1);
                break;
            }
            case PYRAMID_COLUMNS: {
                int h = levelHeight[1];
                Pyramids.smoothColumns(pyramidScratch, levelHeight[0], pendingPyramid[1], levelWidth[1],
                        h * b / count, h * (b + 1) / count);
                break;
            }
            default:
                fillRows(l, gridHeight[l] * b / count, gridHeight[l] * (b + 1) / count);
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
        // the full-size level's plain single steps (the default): a row's window sums first, then all its steps
        final boolean byRow = l == 0 && finestIterations == 1;
        final StepRow row = band.row;
        if (byRow) {
            row.pixels = windowPixels;
            row.lambda = lambda;
            row.u = gu;
            row.v = gv;
            row.confidence = gc;
            row.a = gridA[0];
            row.b = gridB[0];
            row.c = gridC[0];
            row.mean = gridMean[0];
            row.windowMean = windowMean;
            row.residual = gridResidual[0];
        }
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
                    // where the coarse neighbours disagree (a motion boundary), blending them gives a motion that
                    // belongs to neither side: start from whichever explains this window best instead
                    float loU = cu[r0 + c0];
                    float hiU = loU;
                    float loV = cv[r0 + c0];
                    float hiV = loV;
                    for (int q = 1; q < 4; q++) {
                        final int o = ((q & 2) == 0 ? r0 : r1) + ((q & 1) == 0 ? c0 : c1);
                        loU = Math.min(loU, cu[o]);
                        hiU = Math.max(hiU, cu[o]);
                        loV = Math.min(loV, cv[o]);
                        hiV = Math.max(hiV, cv[o]);
                    }
                    if ((hiU - loU) * scaleX + (hiV - loV) * scaleY > START_SPREAD) {
                        // the blend first, then the four neighbours' own motions; costs are compared in that order
                        final float[] su = band.startU;
                        final float[] sv = band.startV;
                        su[0] = u0;
                        sv[0] = v0;
                        for (int q = 0; q < 4; q++) {
                            final int o = ((q & 2) == 0 ? r0 : r1) + ((q & 1) == 0 ? c0 : c1);
                            su[q + 1] = scaleX * cu[o];
                            sv[q + 1] = scaleY * cv[o];
                        }
                        startCosts(l, i0, i1, w, h, cx, cy, band);
                        final float[] cost = band.startCost;
                        float best = cost[0];
                        // and the still ground's own motion: a fixed camera sees mostly still ground, which the
                        // coarse level may have dragged along with a mover next to it
                        final float still = windowCost(l, i0, i1, w, h, cx, cy, 0f, 0f);
                        if (still < best) {
                            best = still;
                            u0 = 0f;
                            v0 = 0f;
                        }
                        for (int q = 1; q < START_CANDIDATES; q++) {
                            if (cost[q] < best) {
                                best = cost[q];
                                u0 = su[q];
                                v0 = sv[q];
                            }
                        }
                    }
                }
                final int g = j * gw + i;
                if (byRow) {
                    row.u0[i] = u0;
                    row.v0[i] = v0;
                    band.inRow[i] = rowSums(i0, i1, w, h, cx, cy, u0, v0, band, i);
                    continue;
                }
                solvePoint(i0, i1, w, h, cx, cy, u0, v0, band, gu, gv, gc, g, l, null);
                adapt(i0, i1, w, h, cx, cy, u0, v0, band, gu, gv, gc, g, l);
            }
            if (byRow) {
                row.first = j * gw;
                kernel.steps(row, gw);
                for (int i = 0; i < gw; i++) {
                    final int cx = centre(l, i, w);
                    final int g = j * gw + i;
                    if (!band.inRow[i]) {
                        // a window by the picture's border, or moved out of it: solved with clamps, point by point
                        solvePoint(i0, i1, w, h, cx, cy, row.u0[i], row.v0[i], band, gu, gv, gc, g, l, null);
                    }
                    adapt(i0, i1, w, h, cx, cy, row.u0[i], row.v0[i], band, gu, gv, gc, g, l);
                }
            }
        }
    }

    /**
     * The window sums of the full-size row's point i (centre cx, cy) for its plain single step from (u0, v0), into
     * the band's {@link StepRow}, as {@link #solvePoint} takes them; false where the window or its one-pixel frame
     * leaves the picture, or the window moved by the start does (the point is then solved by solvePoint).
     */
    private boolean rowSums(float[] i0, float[] i1, int w, int h, int cx, int cy, float u0, float v0, Band band,
            int i) {
        final int r = radius;
        float fx0 = cx + u0;
        float fy0 = cy + v0;
        fx0 = fx0 < 0f ? 0f : (fx0 > w - 1 ? w - 1 : fx0);
        fy0 = fy0 < 0f ? 0f : (fy0 > h - 1 ? h - 1 : fy0);
        final int wx0 = (int) fx0;
        final int wy0 = (int) fy0;
        if (cx - r < 1 || cy - r < 1 || cx + r + 1 >= w || cy + r + 1 >= h
                || wx0 - r < 0 || wy0 - r < 0 || wx0 + r + 1 >= w || wy0 + r + 1 >= h) {
            return false;
        }
        final float ax = fx0 - wx0;
        final float ay = fy0 - wy0;
        final int shift = (wy0 - cy) * w + (wx0 - cx);
        final float[] sums = band.sums;
        kernel.windowSums(i0, i1, w, (cy - r) * w + cx - r, shift, 2 * r + 1, (1f - ax) * (1f - ay),
                ax * (1f - ay), (1f - ax) * ay, ax * ay, sums);
        final StepRow row = band.row;
        for (int s = 0, at = i; s < 10; s++, at += row.stride) {
            row.sums[at] = sums[s];
        }
        return true;
    }

    /**
     * Where point g's plain solve left a large residual (two motions in the window), solves it again from its
     * centre's side (pixels weighed by likeness to the centre) and keeps that if it fits far better.
     */
    private void adapt(float[] i0, float[] i1, int w, int h, int cx, int cy, float u0, float v0, Band band,
            float[] gu, float[] gv, float[] gc, int g, int l) {
        final float plainResidual = gridResidual[l][g];
        if (plainResidual > ADAPT_RESIDUAL) {
            final float pu = gu[g];
            final float pv = gv[g];
            final float pc = gc[g];
            final float pa = gridA[l][g];
            final float pb = gridB[l][g];
            final float pcc = gridC[l][g];
            final float pm = gridMean[l][g];
            solvePoint(i0, i1, w, h, cx, cy, u0, v0, band, gu, gv, gc, g, l, WINDOW_LIKE);
            if (gridResidual[l][g] > ADAPT_GAIN * plainResidual) {
                gu[g] = pu;
                gv[g] = pv;
                gc[g] = pc;
                gridA[l][g] = pa;
                gridB[l][g] = pb;
                gridC[l][g] = pcc;
                gridMean[l][g] = pm;
                gridResidual[l][g] = plainResidual;
            }
        }
    }

    /**
     * Pyramid level (0 = full size) on which, besides the full-size level, badly explained textured points search
     * for their motion; a picture larger than the reference size ({@link #REFERENCE_SIZE}) also searches one level
     * further up per doubling of its size.
     */
    static final int SEARCH_LEVEL = 1;
    /** Search radius on that level, its pixels (± 8 px at full size at the reference size). */
    static final int SEARCH_RADIUS = 4;
    /**
     * Search radius of the full-size level, pixels of the level whose windows it compares (the full-size level, and
     * on a larger picture {@link #referenceLevel} too): the same reach as {@link #SEARCH_RADIUS} on the half-size
     * level. Chosen on the object-motion benchmark's tune half (every 7th case; caught / object EPE / ring EPE):
     * no full-size search 0.83 / 0.81 / 0.40; radius 6 0.86 / 0.67 / 0.42; 8 0.87 / 0.62 / 0.43; 10 0.86 / 0.70 /
     * 0.44; 12 0.85 / 0.78 / 0.44 (a wider search finds more chance matches in a photograph's texture).
     */
    static final int FINE_SEARCH_RADIUS = 8;
    /**
     * The picture size (longer side, pixels) at which the searches' and the flat settle's reaches were chosen: the
     * object-motion benchmark's 320×240 (and the analysis picture's default width). A larger picture of the same
     * scene shows the same motion and the same movers as more pixels, so those reaches grow with it
     * ({@link #sceneScale}).
     */
    static final int REFERENCE_SIZE = 320;
    /**
     * Where the full-size search compares windows on a coarser level (a picture larger than the reference size),
     * the shift it finds is kept only where, solved at full size, it leaves at most this share of the window's
     * residual: as the search's own test, explaining the window at least twice as well. Without it one vector of
     * the real pair rubberwhale1/2 (584×388, opencv-doc) took a chance match 10 px long; on the object-motion
     * benchmark at twice the size (tune half, with the full-size search on the coarser level only) 0.884 / 1.249 /
     * 0.644 without it, 0.883 / 1.255 / 0.643 with it.
     */
    static final float FOUND_GAIN = 0.5f;
    /**
     * The full-size search takes its best shift only when it is distinct: its cost at most this share of the best
     * cost more than one lattice step away. In a repeating pattern (a fence, a grating, tiles) many shifts match
     * about as well, and the best of them is chance. 0.64 is the square of the 0.8 distance ratio of Lowe's
     * (2004) nearest-neighbour test, as the costs here are squared differences. On `MotionBoundaryTest`'s pair
     * (two textures made of sinusoids) the search without it took chance shifts at the square's outline (caught
     * 0.84 → 0.78); with it 0.84 as without any full-size search, and the object-motion benchmark's tune half is
     * unchanged (0.87 / 0.63 / 0.42 against 0.87 / 0.62 / 0.43).
     */
    static final float FINE_SEARCH_DISTINCT = 0.64f;
    /** Residual per pixel (grey levels²) above which a textured point searches (as FILL_RESIDUAL_KEEP). */
    static final float SEARCH_RESIDUAL = 30f;
    /**
     * And above this many times the median residual of the level's textured points: in heavy sensor noise every
     * window is badly explained, and searching them all would buy nothing for its cost.
     */
    static final float SEARCH_OVER_MEDIAN = 4f;

    /**
     * Runs {@link #search} on level l's textured points whose residual stands out (after all are solved). On the
     * half-size level a grid point lies 8 px from the next, so a mover of about that size that jumps farther than
     * its size may have no window of its own there; on the full-size level it has a few.
     */
    private void searchLevel(int l) {
        final float[] res = gridResidual[l];
        final float[] gc = gridConfidence[l];
        final float[] scratch = searchScratch;
        int n = 0;
        // without branching on texture (noise to the branch predictor): every residual is copied, the count
        // moves on past the textured points' only
        for (int g = 0; g < res.length; g++) {
            scratch[n] = res[g];
            n += gc[g] >= FILL_KEEP ? 1 : 0;
        }
        if (n == 0) {
            return;
        }
        final float bar = Math.max(SEARCH_RESIDUAL,
                SEARCH_OVER_MEDIAN * Quickselect.kth(scratch, n, n / 2, searchInside, searchSample));
        final int w = levelWidth[l];
        final int h = levelHeight[l];
        final int gw = gridWidth[l];
        for (int j = 0; j < gridHeight[l]; j++) {
            final int cy = centre(l, j, h);
            for (int i = 0; i < gw; i++) {
                final int g = j * gw + i;
                // one branch, taken rarely (the texture test alone would be taken about every other point)
                if ((gc[g] >= FILL_KEEP) & (res[g] > bar)) {
                    final int cx = centre(l, i, w);
                    search(cx, cy, bands[0], gridU[l], gridV[l], gc, g, l, l);
                    // on a picture larger than the reference size, a point the full-size search left badly explained
                    // searches again on the level of about the reference size: farther, with windows that see as
                    // much of the scene as at the reference size
                    if (l == 0 && referenceLevel > 0 && res[g] > bar) {
                        search(cx, cy, bands[0], gridU[l], gridV[l], gc, g, l, referenceLevel);
                    }
                }
            }
        }
    }

    /**
     * A small mover that jumps farther than its size between frames is gone on the coarse levels that would
     * bring its motion within reach, so the point starts from the ground's motion and its window stays badly
     * explained. Such a textured point tries every whole-pixel shift within {@link #SEARCH_RADIUS} (block
     * matching with {@link #windowCost}, mean-free sum of squared differences), and where the best one explains its window at least
     * twice as well as the solved motion, solves again from there, keeping the new motion only if its residual
     * is smaller. On the full-size level, where the reach is {@link #FINE_SEARCH_RADIUS}, the shifts are first
     * tried two pixels apart on every other pixel of the window ({@link #latticeCost}); if the best of them is
     * distinct ({@link #FINE_SEARCH_DISTINCT}), it and its eight whole-pixel neighbours are tried on the whole
     * window: a third of the reads of trying every shift, and on
     * the object-motion benchmark's tune half (every 7th case) the same figures as trying every shift (caught /
     * object EPE / ring EPE 0.87 / 0.62 / 0.43 both). On a picture k times the reference size
     * ({@link #REFERENCE_SIZE}) both searches also run on levels k times coarser: a point the full-size search leaves
     * badly explained searches again on {@link #referenceLevel} (level {@code sl}), where a 5×5 window sees as much
     * of the scene as at the reference size and the reach is k times as many full-size pixels; the point is then
     * solved at full size from the shift found, kept only where that halves its residual ({@link #FOUND_GAIN}). The
     * coarse search runs on {@link #coarseSearchLevel} as well as on {@link #SEARCH_LEVEL}. On the object-motion
     * benchmark at twice the size (tune half, all cases; caught / object EPE / ring EPE): 0.831 / 1.707 / 0.541 with
     * the reference levels only, 0.887 / 1.248 / 0.507 so; searching only on the coarser levels gave 0.883 / 1.259
     * / 0.501 there but lost small far movers (640×480 with the benchmark's 8–48 px movers, every 7th tune case:
     * 0.869 / 0.645 / 0.386 against 0.903 / 0.554 / 0.397 searching on both).
     */
    private void search(int cx, int cy, Band band, float[] gu, float[] gv, float[] gc, int g, int l, int sl) {
        final int f = 1 << (sl - l);
        final float[] i0 = earlier[sl];
        final float[] i1 = later[sl];
        final int w = levelWidth[sl];
        final int h = levelHeight[sl];
        final int x = Math.min(w - 1, (cx + f / 2) / f);
        final int y = Math.min(h - 1, (cy + f / 2) / f);
        float best = 0.5f * windowCost(sl, i0, i1, w, h, x, y, gu[g] / f, gv[g] / f);
        // the whole-pixel shifts tried on the whole window: every one within reach on the half-size level, the
        // best lattice shift and its neighbours on the full-size level
        int x0 = -SEARCH_RADIUS;
        int x1 = SEARCH_RADIUS;
        int y0 = -SEARCH_RADIUS;
        int y1 = SEARCH_RADIUS;
        if (l == 0) {
            final int r = FINE_SEARCH_RADIUS;
            final int step = 2;
            float coarse = Float.MAX_VALUE;
            int ox = 0;
            int oy = 0;
            final float[] lc = latticeCosts;
            int m = 0;
            for (int dy = -r; dy <= r; dy += step) {
                for (int dx = -r; dx <= r; dx += step) {
                    final float cost = latticeCost(i0, i1, w, h, x, y, dx, dy);
                    lc[m++] = cost;
                    if (cost < coarse) {
                        coarse = cost;
                        ox = dx;
                        oy = dy;
                    }
                }
            }
            // the best cost more than one lattice step from the best shift
            float other = Float.MAX_VALUE;
            m = 0;
            for (int dy = -r; dy <= r; dy += step) {
                for (int dx = -r; dx <= r; dx += step) {
                    if (Math.abs(dx - ox) > step || Math.abs(dy - oy) > step) {
                        other = Math.min(other, lc[m]);
                    }
                    m++;
                }
            }
            if (coarse > FINE_SEARCH_DISTINCT * other) {
                return;
            }
            x0 = ox - 1;
            x1 = ox + 1;
            y0 = oy - 1;
            y1 = oy + 1;
        }
        int bx = 0;
        int by = 0;
        boolean found = false;
        for (int dy = y0; dy <= y1; dy++) {
            for (int dx = x0; dx <= x1; dx++) {
                final float cost = windowCost(sl, i0, i1, w, h, x, y, dx, dy);
                if (cost < best) {
                    best = cost;
                    bx = dx;
                    by = dy;
                    found = true;
                }
            }
        }
        if (!found) {
            return;
        }
        final float u = gu[g];
        final float v = gv[g];
        final float c = gc[g];
        final float res = gridResidual[l][g];
        solvePoint(earlier[l], later[l], levelWidth[l], levelHeight[l], cx, cy, bx * f, by * f, band, gu, gv, gc, g, l,
                null);
        // compared on a coarser level, the shift must also at least halve the window's residual where it is solved
        if (gridResidual[l][g] >= (f == 1 ? 1f : FOUND_GAIN) * res) {
            gu[g] = u;
            gv[g] = v;
            gc[g] = c;
            gridResidual[l][g] = res;
        }
    }

    /** Spread of the coarse neighbours' motion (sum of u and v ranges, pixels) above which starts are compared. */
    // 1 px: below it, the coarse neighbours' differences on a noisy texture moving as one trigger the comparison
    // at most points (FlowBenchmark: 3.9 ms instead of 1.9 ms per 320×240 frame) for no gain on small movers
    static final float START_SPREAD = 1.0f;

    /** Starts compared at a motion boundary: the coarse neighbours' blend and each of the four neighbours. */
    static final int START_CANDIDATES = 5;

    /**
     * {@link #windowCost} of each of the band's {@link #START_CANDIDATES} starts into {@code band.startCost}. Where
     * all five windows lie inside the picture, one pass over the window works out all five costs: the template
     * pixel is read once, and five independent sums keep the processor busy where one would wait on its own last
     * addition. Each cost is summed in the same order and by the same formula as {@link #windowCost}: the same
     * bits.
     */
    private void startCosts(int l, float[] i0, float[] i1, int w, int h, int cx, int cy, Band band) {
        final int r = radius;
        final float[] su = band.startU;
        final float[] sv = band.startV;
        final float[] cost = band.startCost;
        boolean inside = cx - r >= 0 && cy - r >= 0 && cx + r < w && cy + r < h;
        // each start's whole-pixel corner and its bilinear weights, as windowCost works them out
        final int[] at = band.startAt;
        final float[] wts = band.startWeights;
        for (int c = 0; c < START_CANDIDATES && inside; c++) {
            float fx = cx + su[c];
            float fy = cy + sv[c];
            fx = fx < 0f ? 0f : (fx > w - 1 ? w - 1 : fx);
            fy = fy < 0f ? 0f : (fy > h - 1 ? h - 1 : fy);
            final int ix = (int) fx;
            final int iy = (int) fy;
            final float ax = fx - ix;
            final float ay = fy - iy;
            wts[4 * c] = (1f - ax) * (1f - ay);
            wts[4 * c + 1] = ax * (1f - ay);
            wts[4 * c + 2] = (1f - ax) * ay;
            wts[4 * c + 3] = ax * ay;
            at[c] = iy * w + ix;
            inside = ix - r >= 0 && iy - r >= 0 && ix + r + 1 < w && iy + r + 1 < h;
        }
        if (!inside) {
            for (int c = 0; c < START_CANDIDATES; c++) {
                cost[c] = windowCost(l, i0, i1, w, h, cx, cy, su[c], sv[c]);
            }
            return;
        }
        final float a00 = wts[0];
        final float a01 = wts[1];
        final float a10 = wts[2];
        final float a11 = wts[3];
        final float b00 = wts[4];
        final float b01 = wts[5];
        final float b10 = wts[6];
        final float b11 = wts[7];
        final float c00 = wts[8];
        final float c01 = wts[9];
        final float c10 = wts[10];
        final float c11 = wts[11];
        final float d00 = wts[12];
        final float d01 = wts[13];
        final float d10 = wts[14];
        final float d11 = wts[15];
        final float e00 = wts[16];
        final float e01 = wts[17];
        final float e10 = wts[18];
        final float e11 = wts[19];
        final int atA = at[0];
        final int atB = at[1];
        final int atC = at[2];
        final int atD = at[3];
        final int atE = at[4];
        float sa = 0f;
        float saa = 0f;
        float sb = 0f;
        float sbb = 0f;
        float sc = 0f;
        float scc = 0f;
        float sd = 0f;
        float sdd = 0f;
        float se = 0f;
        float see = 0f;
        final int[] offsets = windowOffset[l];
        final int centre = cy * w + cx;
        for (int k = 0; k < windowPixels; k++) {
            final int o = offsets[k];
            final float t = i0[centre + o];
            int q = atA + o;
            final float da = a00 * i1[q] + a01 * i1[q + 1] + a10 * i1[q + w] + a11 * i1[q + w + 1] - t;
            q = atB + o;
            final float db = b00 * i1[q] + b01 * i1[q + 1] + b10 * i1[q + w] + b11 * i1[q + w + 1] - t;
            q = atC + o;
            final float dc = c00 * i1[q] + c01 * i1[q + 1] + c10 * i1[q + w] + c11 * i1[q + w + 1] - t;
            q = atD + o;
            final float dd = d00 * i1[q] + d01 * i1[q + 1] + d10 * i1[q + w] + d11 * i1[q + w + 1] - t;
            q = atE + o;
            final float de = e00 * i1[q] + e01 * i1[q + 1] + e10 * i1[q + w] + e11 * i1[q + w + 1] - t;
            sa += da;
            saa += da * da;
            sb += db;
            sbb += db * db;
            sc += dc;
            scc += dc * dc;
            sd += dd;
            sdd += dd * dd;
            se += de;
            see += de * de;
        }
        cost[0] = saa - sa * sa / windowPixels;
        cost[1] = sbb - sb * sb / windowPixels;
        cost[2] = scc - sc * sc / windowPixels;
        cost[3] = sdd - sd * sd / windowPixels;
        cost[4] = see - se * se / windowPixels;
    }

    /**
     * {@link #windowCost} of the whole-pixel shift (u, v) on the full-size level, from every other pixel of the window
     * in each direction (9 of a 5×5 window's 25), scaled to the whole window; the largest value where either window
     * leaves the picture (the search then does not go there).
     */
    private float latticeCost(float[] i0, float[] i1, int w, int h, int cx, int cy, int u, int v) {
        final int r = radius;
        if (cx - r < 0 || cy - r < 0 || cx + r >= w || cy + r >= h
                || cx + u - r < 0 || cy + v - r < 0 || cx + u + r >= w || cy + v + r >= h) {
            return Float.MAX_VALUE;
        }
        final int shift = v * w + u;
        float sd = 0f;
        float sdd = 0f;
        int n = 0;
        for (int dy = -r; dy <= r; dy += 2) {
            final int row = (cy + dy) * w + cx;
            for (int dx = -r; dx <= r; dx += 2) {
                final float d = i1[row + dx + shift] - i0[row + dx];
                sd += d;
                sdd += d * d;
                n++;
            }
        }
        return (sdd - sd * sd / n) * windowPixels / n;
    }

    /**
     * Sum of squared mean-free differences between the window around (cx, cy) in the earlier frame and the later
     * frame moved by (u, v), bilinear, borders replicated: how badly that motion explains the window.
     */
    private float windowCost(int l, float[] i0, float[] i1, int w, int h, int cx, int cy, float u, float v) {
        final int r = radius;
        float fx = cx + u;
        float fy = cy + v;
        fx = fx < 0f ? 0f : (fx > w - 1 ? w - 1 : fx);
        fy = fy < 0f ? 0f : (fy > h - 1 ? h - 1 : fy);
        final int ix = (int) fx;
        final int iy = (int) fy;
        final float ax = fx - ix;
        final float ay = fy - iy;
        final float w00 = (1f - ax) * (1f - ay);
        final float w01 = ax * (1f - ay);
        final float w10 = (1f - ax) * ay;
        final float w11 = ax * ay;
        float sd = 0f;
        float sdd = 0f;
        if (cx - r >= 0 && cy - r >= 0 && cx + r < w && cy + r < h
                && ix - r >= 0 && iy - r >= 0 && ix + r + 1 < w && iy + r + 1 < h) {
            // both windows inside the picture (most calls): no clamps, one flat loop
            final int[] offsets = windowOffset[l];
            final int centre = cy * w + cx;
            final int at = iy * w + ix;
            if (ax == 0f && ay == 0f) {
                // a whole-pixel shift (the still start, every shift of the search): the bilinear weights are 1, 0,
                // 0, 0 and the blend is the pixel itself, bit for bit
                for (int k = 0; k < windowPixels; k++) {
                    final float d = i1[at + offsets[k]] - i0[centre + offsets[k]];
                    sd += d;
                    sdd += d * d;
                }
                return sdd - sd * sd / windowPixels;
            }
            for (int k = 0; k < windowPixels; k++) {
                final int p = centre + offsets[k];
                final int q = at + offsets[k];
                final float d = w00 * i1[q] + w01 * i1[q + 1] + w10 * i1[q + w] + w11 * i1[q + w + 1] - i0[p];
                sd += d;
                sdd += d * d;
            }
            return sdd - sd * sd / windowPixels;
        }
        for (int dy = -r; dy <= r; dy++) {
            final int y = clamp(cy + dy, h) * w;
            final int y0 = clamp(iy + dy, h) * w;
            final int y1 = clamp(iy + dy + 1, h) * w;
            for (int dx = -r; dx <= r; dx++) {
                final int x0 = clamp(ix + dx, w);
                final int x1 = clamp(ix + dx + 1, w);
                final float d = w00 * i1[y0 + x0] + w01 * i1[y0 + x1] + w10 * i1[y1 + x0] + w11 * i1[y1 + x1]
                        - i0[y + clamp(cx + dx, w)];
                sd += d;
                sdd += d * d;
            }
        }
        return sdd - sd * sd / windowPixels;
    }

    /**
     * Solves one window; writes flow and confidence of grid point g. The first pass over the window loads the
     * template (values, gradients, structure tensor) and, where the window warped by the starting flow lies
     * inside the picture, the first residuals too, so a single-step solve reads each pixel once.
     */
    private void solvePoint(float[] i0, float[] i1, int w, int h, int cx, int cy, float u0, float v0, Band band,
            float[] gu, float[] gv, float[] gc, int g, int l, float[] like) {
        final boolean finest = l == 0;
        final int r = radius;
        final int n = windowPixels;
        final float[] t = band.t;
        final float[] gx = band.gx;
        final float[] gy = band.gy;
        final float maxX = w - 1;
        final float maxY = h - 1;
        final float[] wt = band.wt;
        // null: every pixel weighs the same (the plain solve; its loops carry no weights, see ADAPT_RESIDUAL)
        final boolean weighed = like != null;
        final float centreValue = i0[clamp(cy, h) * w + clamp(cx, w)];
        float sw = 0f;
        float sx = 0f;
        float sy = 0f;
        float sxx = 0f;
        float sxy = 0f;
        float syy = 0f;
        float sd = 0f;
        float st = 0f;
        float sm = 0f;
        float sxd = 0f;
        float sdd = 0f;
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
                final int[] offsets = windowOffset[l];
                final int centre = cy * w + cx;
                if (!weighed && !keep) {
                    // the plain single step (the full-size level's default: most points of a frame), in the kernel:
                    // no weights, the gradients' factor 1/2 taken out of the sums, as below
                    final float[] sums = band.sums;
                    kernel.windowSums(i0, i1, w, centre - r * w - r, shift, 2 * r + 1, w00, w01, w10, w11, sums);
                    st = sums[0];
                    sx = 0.5f * sums[1];
                    sy = 0.5f * sums[2];
                    sxx = 0.25f * sums[3];
                    sxy = 0.25f * sums[4];
                    syy = 0.25f * sums[5];
                    sd = sums[6];
                    sxd = 0.5f * sums[7];
                    sdd = sums[8];
                    syd = 0.5f * sums[9];
                    sw = n;
                    sm = st;
                } else if (!weighed) {
                    // the plain solve with further steps: no weights, and the gradients' factor 1/2 taken out of the
                    // sums. Halving is exact in floating point, so every sum below is exactly twice (or four times)
                    // the sum of halved terms, and scaling it afterwards gives the same bits as the general loop.
                    for (k = 0; k < n; k++) {
                        final int p = centre + offsets[k];
                        final float ix = i0[p + 1] - i0[p - 1];
                        final float iy = i0[p + w] - i0[p - w];
                        final float tv = i0[p];
                        final int q = p + shift;
                        final float d = w00 * i1[q] + w01 * i1[q + 1] + w10 * i1[q + w] + w11 * i1[q + w + 1] - tv;
                        if (keep) {
                            // the further steps read the template (their sums carry no weights: wt is not read)
                            t[k] = tv;
                            gx[k] = 0.5f * ix;
                            gy[k] = 0.5f * iy;
                        }
                        st += tv;
                        sx += ix;
                        sy += iy;
                        sxx += ix * ix;
                        sxy += ix * iy;
                        syy += iy * iy;
                        sd += d;
                        sxd += ix * d;
                        sdd += d * d;
                        syd += iy * d;
                    }
                    sw = n;
                    sm = st;
                    sx *= 0.5f;
                    sy *= 0.5f;
                    sxx *= 0.25f;
                    sxy *= 0.25f;
                    syy *= 0.25f;
                    sxd *= 0.5f;
                    syd *= 0.5f;
                } else {
                    for (k = 0; k < n; k++) {
                        final int p = centre + offsets[k];
                        final float ix = 0.5f * (i0[p + 1] - i0[p - 1]);
                        final float iy = 0.5f * (i0[p + w] - i0[p - w]);
                        final float tv = i0[p];
                        final int q = p + shift;
                        final float d = w00 * i1[q] + w01 * i1[q + 1] + w10 * i1[q + w] + w11 * i1[q + w + 1] - tv;
                        final float dc = tv - centreValue;
                        final float o = like == null ? 1f : like[(int) (dc < 0f ? -dc : dc)];
                        if (keep) {
                            t[k] = tv;
                            gx[k] = ix;
                            gy[k] = iy;
                            wt[k] = o;
                        }
                        final float oix = o * ix;
                        final float oiy = o * iy;
                        final float od = o * d;
                        sw += o;
                        st += tv;
                        sm += o * tv;
                        sx += oix;
                        sy += oiy;
                        sxx += oix * ix;
                        sxy += oix * iy;
                        syy += oiy * iy;
                        sd += od;
                        sxd += oix * d;
                        sdd += od * d;
                        syd += oiy * d;
                    }
                }
                firstResidualsDone = true;
            } else {
                final int[] offsets = windowOffset[l];
                final int centre = cy * w + cx;
                for (k = 0; k < n; k++) {
                    final int p = centre + offsets[k];
                    final float ix = 0.5f * (i0[p + 1] - i0[p - 1]);
                    final float iy = 0.5f * (i0[p + w] - i0[p - w]);
                    final float tv = i0[p];
                    final float dc = tv - centreValue;
                    final float o = like == null ? 1f : like[(int) (dc < 0f ? -dc : dc)];
                    t[k] = tv;
                    gx[k] = ix;
                    gy[k] = iy;
                    wt[k] = o;
                    sw += o;
                    st += tv;
                    sm += o * tv;
                    sx += o * ix;
                    sy += o * iy;
                    sxx += o * ix * ix;
                    sxy += o * ix * iy;
                    syy += o * iy * iy;
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
                    final float tv = i0[row + x];
                    final float dc = tv - centreValue;
                    final float o = like == null ? 1f : like[(int) (dc < 0f ? -dc : dc)];
                    t[k] = tv;
                    gx[k] = ix;
                    gy[k] = iy;
                    wt[k] = o;
                    sw += o;
                    st += tv;
                    sm += o * tv;
                    sx += o * ix;
                    sy += o * iy;
                    sxx += o * ix * ix;
                    sxy += o * ix * iy;
                    syy += o * iy * iy;
                    k++;
                }
            }
        }
        final float invN = 1f / sw;
        // mean-free structure tensor: the brightness offset between the frames is an extra unknown, eliminated
        final float cxx = sxx - sx * sx * invN;
        final float cxy = sxy - sx * sy * invN;
        final float cyy = syy - sy * sy * invN;
        final float half = 0.5f * (cxx - cyy) * invN;
        final float e = 0.5f * (cxx + cyy) * invN - (float) Math.sqrt(half * half + cxy * cxy * invN * invN);
        gc[g] = e > 0f ? e : 0f;
        gridA[l][g] = cxx * invN;
        gridB[l][g] = cxy * invN;
        gridC[l][g] = cyy * invN;
        gridMean[l][g] = sm * invN;
        if (finest) {
            windowMean[g] = st / n;
        }
        // the regulariser is per window pixel: a window weighed down to fewer pixels is pulled as much per pixel
        final float lam = lambda * sw / n;
        final float a = cxx + lam;
        final float c = cyy + lam;
        final float det = a * c - cxy * cxy;
        float u = u0;
        float v = v0;
        // what the window's motion leaves unexplained, per pixel (grey levels²): unknown until residuals are taken
        float residual = UNKNOWN_RESIDUAL;
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
                    sdd = 0f;
                    sxd = 0f;
                    syd = 0f;
                    k = 0;
                    if (ix - r >= 0 && iy - r >= 0 && ix + r + 1 < w && iy + r + 1 < h) {
                        final int[] offsets = windowOffset[l];
                        final int at = iy * w + ix;
                        for (k = 0; k < n; k++) {
                            final int p0 = at + offsets[k];
                            final int p1 = p0 + w;
                            final float warped = w00 * i1[p0] + w01 * i1[p0 + 1] + w10 * i1[p1] + w11 * i1[p1 + 1];
                            final float d = warped - t[k];
                            final float od = weighed ? wt[k] * d : d;
                            sd += od;
                            sxd += gx[k] * od;
                            sdd += od * d;
                            syd += gy[k] * od;
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
                                final float od = weighed ? wt[k] * d : d;
                                sd += od;
                                sxd += gx[k] * od;
                                sdd += od * d;
                                syd += gy[k] * od;
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
                // the linearised residual after this step: |d|² − bᵀG⁻¹b, mean-free
                final float left = sdd - sd * sd * invN + bx * du + by * dv;
                residual = (left > 0f ? left : 0f) * invN;
                if (du * du + dv * dv < CONVERGED_STEP2) {
                    break;
                }
            }
        }
        gu[g] = u;
        gv[g] = v;
        gridResidual[l][g] = residual;
    }

    /**
     * Residual per pixel (grey levels², as {@link #FILL_RESIDUAL_KEEP}) above which a window's plain solve counts as
     * badly explained, and the window is solved again with its pixels weighed by likeness to its centre.
     */
    static final float ADAPT_RESIDUAL = 30f;
    /**
     * The weighed solve is kept only where it explains the window (its centre's side) at least this much better
     * than the plain one (residual at most this share of the plain residual): a real boundary between two motions.
     * Where a change of light or noise leaves every window badly explained, weighing buys nothing and would
     * only read motion from fewer pixels.
     */
    static final float ADAPT_GAIN = 0.5f;
    /**
     * Brightness difference, grey levels, between a window pixel and the window's centre pixel at which the
     * pixel's weight halves in the second solve of a badly explained window (adaptive support weights, Yoon &amp;
     * Kweon 2006, as used for flow by Xiao et al. 2006). A window across a mover's outline holds two motions;
     * weighing its pixels by likeness to the centre solves it mostly from the side the centre lies on, so a plain
     * mover's rim is no longer read as still because the textured ground beside it fills most of the window.
     * Chosen on the object-motion benchmark's tune half with every window weighed (caught / object EPE / ring
     * EPE): none 0.833 / 0.778 / 0.773; 8 → 0.861 / 0.670 / 0.794; 12 → 0.863 / 0.672 / 0.789; 24 → 0.860 /
     * 0.688 / 0.788; 32 → 0.856 / 0.701 / 0.781; 48 → 0.850 / 0.720 / 0.780; 24 also kept the whole-picture
     * suite closest to its plain figure (0.116 px plain; 12 → 0.130, 24 → 0.122). Well above a camera's noise
     * (σ 2.5 gives differences of about 3.5).
     */
    static final float WINDOW_BRIGHTNESS = 24f;
    /** 1 / (1 + (Δ / {@link #WINDOW_BRIGHTNESS})²) for each whole grey level Δ of 0 to 255. */
    private static final float[] WINDOW_LIKE = new float[256];

    static {
        for (int d = 0; d < WINDOW_LIKE.length; d++) {
            final float x = d / WINDOW_BRIGHTNESS;
            WINDOW_LIKE[d] = 1f / (1f + x * x);
        }
    }

    /** Fill passes after each level: each carries motion one grid point further into flat ground. */
    static final int FILL_PASSES = 3;
    /** Grid points a level needs before its rows are split into bands. */
    static final int MIN_SHARED_POINTS = 1024;
    /** Smallest eigenvalue, (grey levels per pixel)², from which a point keeps its own motion untouched. */
    static final float FILL_KEEP = 4f;
    /** Weight of a point's own structure tensor against each neighbour's in the fill. */
    static final float FILL_SELF = 2f;
    /** Brightness difference, grey levels, at which a neighbour's weight has fallen to a half. */
    static final float FILL_BRIGHTNESS = 8f;
    /** Residual per pixel (grey levels²) up to which a textured point keeps its own motion. */
    static final float FILL_RESIDUAL_KEEP = 30f;
    /** Residual per pixel (grey levels²) at which a point's weight in the fill halves. */
    static final float FILL_RESIDUAL = 20f;
    /** Residual recorded for a window whose motion could not be solved: no weight in the fill. */
    static final float UNKNOWN_RESIDUAL = 1e6f;
    /** Motion difference, pixels, at which a textured point's neighbour weight halves. */
    static final float FILL_ALIKE = 0.25f;
    /** 1 / {@link #FILL_ALIKE}², the factor of a squared motion difference. */
    static final float FILL_INV_ALIKE = 1f / (FILL_ALIKE * FILL_ALIKE);
    /** Share of a filled point's support that it hands on in the next pass. */
    static final float FILL_DECAY = 0.6f;
    /** Tensor weight pulling a point towards its own current motion: keeps a point with no support still. */
    static final float FILL_HOLD = 1e-2f;

    /**
     * One fill pass over grid rows [j0, j1) of level l, from gridU/gridV into smoothU/smoothV (the caller swaps).
     * A point with enough texture ({@link #FILL_KEEP}) keeps its motion: a small mover is not pulled towards the
     * still ground around it. Any other point takes the motion that best agrees with its own structure tensor and
     * its 3×3 neighbours' tensors, each neighbour weighted by how alike the two windows' brightness is: the
     * least-squares combination (Σ wⱼ Gⱼ)⁻¹ Σ wⱼ Gⱼ uⱼ. An edge point's tensor constrains only the motion across
     * its edge, so a plain surface framed by edges of several directions gets the full motion of its rim, and an
     * edge point keeps its own motion across the edge while borrowing the part along it. The points off the grid's
     * rim go to the kernel ({@link FlowKernel#fillInside}), which gives the same bits as the loop here.
     */
    private void fillRows(int l, int j0, int j1) {
        final int gw = gridWidth[l];
        final int gh = gridHeight[l];
        final float[] u = gridU[l];
        final float[] v = gridV[l];
        final float[] nu = smoothU[l];
        final float[] nv = smoothV[l];
        final float[] ta = supportA[l];
        final float[] tb = supportB[l];
        final float[] tc = supportC[l];
        final float[] na = nextA[l];
        final float[] nb = nextB[l];
        final float[] nc = nextC[l];
        final float[] keptAt = fillKept;
        final float decay = FILL_DECAY;
        // on the coarse levels a small mover spans few points and its motion differs from the ground's by little
        // there: textured points keep their own motion; only the full-size level averages alike neighbours
        final boolean denoise = l == 0;
        final float self = FILL_SELF;
        final float[] near = fillWeight;
        final int stride = fillStride;
        // the points off the grid's top and bottom rows as one flat run for the kernel; the run's points in the
        // first and last columns have neighbours that wrap to the next row, so they are filled again here, and so
        // is whatever the kernel leaves
        final int from = Math.max(j0, 1) * gw + 1;
        final int to = Math.min(j1, gh - 1) * gw - 1;
        final int done = from < to ? kernel.fillInside(fillPass, from, to) : from;
        for (int j = j0; j < j1; j++) {
            final boolean rimRow = j == 0 || j + 1 == gh;
            for (int i = 0; i < gw; i++) {
                final int k = j * gw + i;
                final boolean rim = rimRow || i == 0 || i + 1 == gw;
                if (!rim && k >= from && k < done) {
                    continue;
                }
                final boolean kept = keptAt[k] != 0f;
                if (kept) {
                    na[k] = ta[k];
                    nb[k] = tb[k];
                    nc[k] = tc[k];
                    if (!denoise) {
                        nu[k] = u[k];
                        nv[k] = v[k];
                        continue;
                    }
                }
                final float ws = self;
                final float uk = u[k];
                final float vk = v[k];
                float a = ws * ta[k] + FILL_HOLD;
                float b = ws * tb[k];
                float cc = ws * tc[k] + FILL_HOLD;
                float ru = a * u[k] + b * v[k];
                float rv = b * u[k] + cc * v[k];
                // one flat loop over the neighbours (C2 compiles it far better than two nested loops of two or
                // three steps), in the same row order, so the sums are the same
                for (int n = 0; n < NEIGHBOURS; n++) {
                    final int ii = i + NEIGHBOUR_DI[n];
                    final int jj = j + NEIGHBOUR_DJ[n];
                    if (rim && (ii < 0 || ii >= gw || jj < 0 || jj >= gh)) {
                        continue;
                    }
                    final int q = jj * gw + ii;
                    float wq = near[n * stride + k];
                    if (kept) {
                        // a textured point averages only with neighbours that move alike: sensor noise is
                        // smoothed out, a motion boundary is not crossed
                        final float du = u[q] - uk;
                        final float dv = v[q] - vk;
                        final float apart = (du * du + dv * dv) * FILL_INV_ALIKE;
                        wq = apart < 4f ? wq / (1f + apart) : 0f;
                    }
                    final float qa = wq * ta[q];
                    final float qb = wq * tb[q];
                    final float qc = wq * tc[q];
                    a += qa;
                    b += qb;
                    cc += qc;
                    ru += qa * u[q] + qb * v[q];
                    rv += qb * u[q] + qc * v[q];
                }
                final float det = a * cc - b * b;
                if (det > 1e-12f) {
                    nu[k] = (cc * ru - b * rv) / det;
                    nv[k] = (a * rv - b * ru) / det;
                } else {
                    nu[k] = u[k];
                    nv[k] = v[k];
                }
                if (!kept) {
                    // the support found here passes on, weakened, to the points this one fills next
                    na[k] = decay * a;
                    nb[k] = decay * b;
                    nc[k] = decay * cc;
                }
            }
        }
    }

    /** Sets {@link #fillPass} to level l's current arrays before a pass. */
    private void preparePass(int l) {
        final FillPass p = fillPass;
        p.gridWidth = gridWidth[l];
        p.full = l == 0;
        p.u = gridU[l];
        p.v = gridV[l];
        p.nextU = smoothU[l];
        p.nextV = smoothV[l];
        p.a = supportA[l];
        p.b = supportB[l];
        p.c = supportC[l];
        p.nextA = nextA[l];
        p.nextB = nextB[l];
        p.nextC = nextC[l];
        p.kept = fillKept;
        p.weight = fillWeight;
        p.weightStride = fillStride;
    }

    /** Neighbours of a grid point in the fill. */
    static final int NEIGHBOURS = 8;
    /** Column and row offsets of the neighbours, in row order (the order of the fill's sums). */
    static final int[] NEIGHBOUR_DI = {-1, 0, 1, -1, 1, -1, 0, 1};
    static final int[] NEIGHBOUR_DJ = {-1, -1, -1, 0, 0, 1, 1, 1};

    /**
     * The fill's brightness weight between each grid point of level l and each neighbour, 1 / (1 + (Δmean /
     * {@link #FILL_BRIGHTNESS})²), into {@link #fillWeight}. A division per pair, once per level: the weight is
     * the same from either side (the squared difference of the two means is), so each pair is worked out from
     * the earlier point and written to both; neighbour n of a point sees it as neighbour {@code NEIGHBOURS − 1 −
     * n}.
     */
    private void fillWeights(int l) {
        final int gw = gridWidth[l];
        final int gh = gridHeight[l];
        final float[] mean = gridMean[l];
        final float[] near = fillWeight;
        if (kernel.fillWeights(mean, gw, gh, near, fillStride)) {
            return;
        }
        final float inv2 = 1f / (FILL_BRIGHTNESS * FILL_BRIGHTNESS);
        for (int j = 0; j < gh; j++) {
            for (int i = 0; i < gw; i++) {
                final int k = j * gw + i;
                final float m = mean[k];
                // the neighbours after k in row order: right, then the three below
                for (int n = NEIGHBOURS / 2; n < NEIGHBOURS; n++) {
                    final int ii = i + NEIGHBOUR_DI[n];
                    final int jj = j + NEIGHBOUR_DJ[n];
                    if (ii < 0 || ii >= gw || jj >= gh) {
                        continue;
                    }
                    final int q = jj * gw + ii;
                    final float dm = mean[q] - m;
                    final float wq = 1f / (1f + dm * dm * inv2);
                    near[n * fillStride + k] = wq;
                    near[(NEIGHBOURS - 1 - n) * fillStride + q] = wq;
                }
            }
        }
    }

    /**
     * Starting support of level l's points before the fill: the data's structure tensor, weakened where the
     * window's own motion leaves much unexplained (a window across a motion boundary fits neither side); and which
     * points keep their own motion ({@link #fillKept}).
     */
    private void initSupport(int l) {
        final float[] ta = gridA[l];
        final float[] tb = gridB[l];
        final float[] tc = gridC[l];
        final float[] res = gridResidual[l];
        final float[] sa = supportA[l];
        final float[] sb = supportB[l];
        final float[] sc = supportC[l];
        final float[] conf = gridConfidence[l];
        final float invRes = 1f / FILL_RESIDUAL;
        final int done = kernel.support(ta, tb, tc, res, conf, sa, sb, sc, fillKept);
        for (int k = done; k < ta.length; k++) {
            fillKept[k] = keeps(conf[k], res[k]) ? 1f : 0f;
            final float wk = 1f / (1f + res[k] * invRes);
            sa[k] = wk * ta[k];
            sb[k] = wk * tb[k];
            sc[k] = wk * tc[k];
        }
    }

    /**
     * Sensor noise variance, grey levels², up to which {@link #PIXEL_STRUCTURE} holds as it is: σ 2.5, the
     * object-motion benchmark's noise, at which it was chosen (just above the gradients such noise gives). Above it
     * the squared level grows with the frame's noise variance; otherwise noise reads as structure on plain ground.
     */
    static final float NOISE_VARIANCE = 6.25f;
    /**
     * What a still window's residual per pixel is of the sensor noise variance on the full-size level: measured on
     * pairs of still frames of pure Gaussian noise (σ 4, 6 and 8 at 320×240: 1.28, 1.24, 1.22). Unsmoothed pixels
     * would give 2 × 22 / 25 = 1.76 (the difference of two noisy frames has twice the variance, less the mean and
     * the two motion components fitted to 25 pixels); the pyramid's full-size level is lightly smoothed.
     */
    static final float RESIDUAL_PER_NOISE = 1.24f;

    /**
     * The full-size level's noise variance over {@link #NOISE_VARIANCE}, at least 1, estimated from the last
     * frame's residuals: their median (most of a fixed camera's picture is still, where a window's residual is the
     * noise's; a point without a solve counts as explained). Only the dense output needs it.
     */
    float noiseScale() {
        final float[] res = gridResidual[0];
        final float[] scratch = searchScratch;
        final int n = res.length;
        for (int g = 0; g < n; g++) {
            final float r = res[g];
            scratch[g] = r < UNKNOWN_RESIDUAL ? r : 0f;
        }
        final float median = Quickselect.kth(scratch, n, n / 2, searchInside, searchSample);
        return Math.max(1f, median / (RESIDUAL_PER_NOISE * NOISE_VARIANCE));
    }

    /** Whether the fill keeps a point's own motion: enough texture and a small residual. */
    private static boolean keeps(float confidence, float residual) {
        return confidence >= FILL_KEEP && residual <= FILL_RESIDUAL_KEEP;
    }

    /** Brightness residual, grey levels, at which a candidate motion's weight in {@link #densify} halves. */
    static final float DENSE_RESIDUAL = 6f;
    /**
     * Difference, grey levels, between a pixel and a grid point's window mean at which that point's weight in
     * {@link #densify} halves (the range kernel of joint bilateral upsampling). Chosen on the object-motion
     * benchmark's tune half: ring error 0.92 (no kernel), 0.84 (12), 0.81 (8), 0.77 (4), 0.74 (2) with caught and
     * object error unchanged; not 2, where the weights hinge on differences at the level of a camera's noise.
     */
    static final float DENSE_BRIGHTNESS = 4f;

    /**
     * The flow at every pixel of the last pair given to {@link #compute} (not {@link #push}), from its grid {@code grid} (this
     * estimator's output): each pixel weighs the motions of the four grid points around it by their bilinear
     * weight, by how well each explains the pixel itself (the later frame moved by that motion against the
     * earlier one) and by how alike the pixel is to the point's window in brightness (joint bilateral upsampling,
     * Kopf et al. 2007), so a pixel at a motion boundary takes the motion of its own side instead of a blend of
     * both, also where both motions explain it (plain ground beside a plain mover). Last, flat pixels not framed
     * by moving structure take the background's motion ({@link #settlePixels}).
     * For pictures, files and benchmarks, not the analysis loop (reads every pixel). Allocates nothing.
     */
    public void densify(FlowField grid, FlowField dense) {
        densify(grid, dense, noiseScale(), globalMeasured);
    }

    /**
     * {@link #densify(FlowField, FlowField)} with the frame's noise factor ({@link #noiseScale}) and whether the
     * global motion counts as measured, both as the caller worked them out.
     */
    private void densify(FlowField grid, FlowField dense, float noise, boolean measured) {
        if (grid.imageWidth != width || grid.imageHeight != height || grid.stride != stride) {
            throw new IllegalArgumentException("grid: " + grid.imageWidth + "x" + grid.imageHeight + " every "
                    + grid.stride + " px (expected this estimator's " + width + "x" + height + " every " + stride + ")");
        }
        if (dense.imageWidth != width || dense.imageHeight != height || dense.stride != 1) {
            throw new IllegalArgumentException("dense: " + dense.imageWidth + "x" + dense.imageHeight + " every "
                    + dense.stride + " px (expected " + width + "x" + height + " every pixel)");
        }
        final float[] i0 = earlier[0];
        final float[] i1 = later[0];
        final int w = width;
        final int h = height;
        final int gw = grid.width;
        final int gh = grid.height;
        final int s = stride;
        final float inv2 = 1f / (DENSE_RESIDUAL * DENSE_RESIDUAL);
        final float brightnessInv2 = 1f / (DENSE_BRIGHTNESS * DENSE_BRIGHTNESS);
        final float[] mean = windowMean;
        for (int y = 0; y < h; y++) {
            float gyf = (float) (y - s / 2) / s;
            gyf = gyf < 0 ? 0 : Math.min(gyf, gh - 1);
            final int j0 = Math.min((int) gyf, Math.max(0, gh - 2));
            final int j1 = Math.min(j0 + 1, gh - 1);
            final float by = gyf - j0;
            for (int x = 0; x < w; x++) {
                float gxf = (float) (x - s / 2) / s;
                gxf = gxf < 0 ? 0 : Math.min(gxf, gw - 1);
                final int c0 = Math.min((int) gxf, Math.max(0, gw - 2));
                final int c1 = Math.min(c0 + 1, gw - 1);
                final float bx = gxf - c0;
                final float t = i0[y * w + x];
                float sw = 0f;
                float su = 0f;
                float sv = 0f;
                float sc = 0f;
                float se = 0f;
                for (int q = 0; q < 4; q++) {
                    final int g = ((q & 2) == 0 ? j0 : j1) * gw + ((q & 1) == 0 ? c0 : c1);
                    final float beta = ((q & 2) == 0 ? 1f - by : by) * ((q & 1) == 0 ? 1f - bx : bx);
                    if (beta <= 0f) {
                        continue;
                    }
                    final float gu = grid.u[g];
                    final float gv = grid.v[g];
                    final float r = sample(i1, w, h, x + gu, y + gv) - t;
                    final float b = t - mean[g];
                    final float wq = beta / ((1f + r * r * inv2) * (1f + b * b * brightnessInv2));
                    sw += wq;
                    su += wq * gu;
                    sv += wq * gv;
                    sc += wq * grid.confidence[g];
                    se += wq * grid.edge[g];
                }
                final int o = y * w + x;
                final float norm = sw > 0f ? 1f / sw : 0f;
                dense.u[o] = su * norm;
                dense.v[o] = sv * norm;
                dense.confidence[o] = sc * norm;
                dense.edge[o] = se * norm;
                final int near = (by < 0.5f ? j0 : j1) * gw + (bx < 0.5f ? c0 : c1);
                dense.normalX[o] = grid.normalX[near];
                dense.normalY[o] = grid.normalY[near];
            }
        }
        dense.globalU = grid.globalU;
        dense.globalV = grid.globalV;
        settlePixels(dense, noise, measured);
    }

    /**
     * Gradient, grey levels per pixel (central differences of the earlier frame), from which a pixel has structure of
     * its own in {@link #settlePixels}. Chosen on the object-motion benchmark's tune half with
     * {@link #PIXEL_SIDES} 2 (caught / object EPE / ring EPE): 4 → 0.849 / 0.733 / 0.635; 6 → 0.848 / 0.735 / 0.408;
     * 8 → 0.844 / 0.750 / 0.266 (without the pixel step 0.851 / 0.728 / 0.782). Above it, sensor noise (σ 2.5 gives
     * gradients of about 2.5) rarely reads as structure on plain ground; a mover's own smooth parts do, and a mover
     * whose smooth parts look like the ground loses them. On a noisier frame it grows with the noise's standard
     * deviation ({@link #noiseScale}): on the benchmark with σ 2.5, whose frames' estimated noise is sometimes above
     * that, ring EPE 0.418 → 0.363 (tune) and 0.381 → 0.333 (held-out), caught and object EPE unchanged.
     */
    static final float PIXEL_STRUCTURE = 6f;
    /**
     * Pixels a flat pixel looks along each axis for the structure that frames it, as {@link #SETTLE_REACH} grid
     * points (24 lost the inside of 48-pixel movers: 0.800 caught; 96 changed nothing against 48). Fixed in pixels,
     * unlike {@link #SETTLE_REACH}: on the benchmark at twice the size (tune half), twice the reach here as well
     * gave 0.888 / 1.240 / 0.591 against 0.887 / 1.248 / 0.507: the ring lost more than the movers gained.
     */
    static final int PIXEL_REACH = 48;
    /**
     * Sides whose nearest structure must move for a flat pixel to keep its motion: 2 here, where the grid step
     * has 3; 3 settled more of the ring (0.263) and of movers' smooth insides too (caught 0.841).
     */
    static final int PIXEL_SIDES = 2;

    /**
     * {@link #settleFlat} again, pixel by pixel, on the dense field: a flat pixel (gradient under
     * {@link #PIXEL_STRUCTURE}) between grid points takes the blend of their motions, and the grid points beside a
     * mover's outline carry the mover's motion, on the ground outside it as inside; nothing in a flat pixel tells
     * the two sides apart. What frames it does: the nearest pixel with structure along each of the four axes,
     * within {@link #PIXEL_REACH}, moving (its dense motion apart from the background's by {@link #SETTLE_MOVING}
     * px or more) or still. Fewer than {@link #PIXEL_SIDES} moving sides and (a still side, or no measured global
     * motion): the pixel takes the background's motion. Four scans over the picture; allocates nothing.
     */
    private void settlePixels(FlowField dense, float noise, boolean measured) {
        final int w = width;
        final int h = height;
        final float[] i0 = earlier[0];
        final byte[] kind = pixelKind;
        final byte[] sides = pixelSides;
        final float bu = dense.globalU;
        final float bv = dense.globalV;
        final float moving2 = SETTLE_MOVING * SETTLE_MOVING;
        final float structure2 = PIXEL_STRUCTURE * PIXEL_STRUCTURE * noise;
        int movingPixels = 0;
        for (int y = 0; y < h; y++) {
            final int row = y * w;
            final int up = (y > 0 ? y - 1 : y) * w;
            final int down = (y + 1 < h ? y + 1 : y) * w;
            for (int x = 0; x < w; x++) {
                final float gx = 0.5f * (i0[row + (x + 1 < w ? x + 1 : x)] - i0[row + (x > 0 ? x - 1 : x)]);
                final float gy = 0.5f * (i0[down + x] - i0[up + x]);
                final int o = row + x;
                if (gx * gx + gy * gy < structure2) {
                    kind[o] = FLAT;
                } else {
                    final float du = dense.u[o] - bu;
                    final float dv = dense.v[o] - bv;
                    final boolean moves = du * du + dv * dv >= moving2;
                    kind[o] = moves ? MOVING : STILL;
                    movingPixels += moves ? 1 : 0;
                }
            }
        }
        if (!measured && movingPixels > SETTLE_MOVERS_SHARE * w * h) {
            return;
        }
        final int reach = PIXEL_REACH;
        // each side: 0 nothing within reach, 1 still structure, 8 moving structure (as settleFlat's side())
        for (int y = 0; y < h; y++) {
            final int row = y * w;
            byte last = FLAT;
            int lastAt = -reach - 1;
            for (int x = 0; x < w; x++) {
                final int o = row + x;
                sides[o] = (byte) (x - lastAt <= reach ? code(last) : 0);
                if (kind[o] != FLAT) {
                    last = kind[o];
                    lastAt = x;
                }
            }
            last = FLAT;
            lastAt = w + reach + 1;
            for (int x = w - 1; x >= 0; x--) {
                final int o = row + x;
                sides[o] += (byte) (lastAt - x <= reach ? code(last) : 0);
                if (kind[o] != FLAT) {
                    last = kind[o];
                    lastAt = x;
                }
            }
        }
        for (int x = 0; x < w; x++) {
            byte last = FLAT;
            int lastAt = -reach - 1;
            for (int y = 0; y < h; y++) {
                final int o = y * w + x;
                sides[o] += (byte) (y - lastAt <= reach ? code(last) : 0);
                if (kind[o] != FLAT) {
                    last = kind[o];
                    lastAt = y;
                }
            }
            last = FLAT;
            lastAt = h + reach + 1;
            for (int y = h - 1; y >= 0; y--) {
                final int o = y * w + x;
                if (kind[o] == FLAT) {
                    final int all = sides[o] + (lastAt - y <= reach ? code(last) : 0);
                    final int moving = all >> 3;
                    final int still = all & 7;
                    if (moving < PIXEL_SIDES && (still > 0 || !measured)) {
                        dense.u[o] = bu;
                        dense.v[o] = bv;
                    }
                } else {
                    last = kind[o];
                    lastAt = y;
                }
            }
        }
    }

    private static int code(byte kind) {
        return kind == MOVING ? 8 : (kind == STILL ? 1 : 0);
    }

    /**
     * The grid flow of the pair, settled again on a noisy frame, then {@link #densify}: each pixel takes the motion
     * of its own side. The second settle: where the frame's noise ({@link #noiseScale}) is above the level the flat
     * settle was chosen at, {@link #settleFlat} runs again with its levels and the global motion's confidence floor
     * grown by it, and the pixel settle ({@link #settlePixels}) takes the global motion as measured at that floor. In
     * such noise, noise alone reads as structure and as confident motion, and a mover's motion floods plain ground
     * framed by noise that carries it. On the object-motion benchmark with σ 6 (every 7th tune case, caught /
     * object EPE / ring EPE): 0.859 / 0.719 / 1.247 without, 0.860 / 0.719 / 1.208 with the grid's levels alone,
     * 0.851 / 0.725 / 0.605 with the floor too, 0.848 / 0.732 / 0.404 with the pixel settle following it; all cases
     * in DEVELOPERS.md ("Other resolutions and heavy noise"). A mover's smooth parts that the noise level calls flat
     * go with the ground. The analysis loop ({@link #push}) reads the grid as
     * {@link #compute} leaves it: its detection defaults were chosen with those levels.
     */
    @Override
    public FlowField computeDense(byte[] first, byte[] second) {
        FlowField grid = newField();
        compute(first, second, grid);
        // in noise above the level the settle's levels were chosen at, noise reads as structure and as confident
        // motion: the mover's motion then floods plain ground, framed by noise that carries it. The dense output is
        // settled again with the levels grown with the noise, and the pixel settle takes the global motion as
        // measured at that level too (the analysis loop reads the grid as compute left it)
        final float noise = noiseScale();
        boolean measured = globalMeasured;
        if (noise > 1f) {
            measured = globalMotion.measure(grid, noise);
            settleFlat(grid, measured, noise);
        }
        FlowField dense = new FlowField(width, height);
        densify(grid, dense, noise, measured);
        return dense;
    }

    /** Bilinear value at a real position, borders replicated. */
    private static float sample(float[] img, int w, int h, float x, float y) {
        x = x < 0f ? 0f : (x > w - 1 ? w - 1 : x);
        y = y < 0f ? 0f : (y > h - 1 ? h - 1 : y);
        final int ix = (int) x;
        final int iy = (int) y;
        final int ix1 = ix + 1 < w ? ix + 1 : ix;
        final int iy1 = iy + 1 < h ? iy + 1 : iy;
        final float ax = x - ix;
        final float ay = y - iy;
        final float top = img[iy * w + ix] + ax * (img[iy * w + ix1] - img[iy * w + ix]);
        final float bottom = img[iy1 * w + ix] + ax * (img[iy1 * w + ix1] - img[iy1 * w + ix]);
        return top + ay * (bottom - top);
    }

    private static void swap(float[][] a, float[][] b, int l) {
        float[] t = a[l];
        a[l] = b[l];
        b[l] = t;
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
