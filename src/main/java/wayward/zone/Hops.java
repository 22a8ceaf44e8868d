package wayward.zone;

import java.util.Arrays;

/**
 * Small movers that hop farther than their own size between analysed frames, found in the picture instead of the
 * flow, for {@link MoverTracker}. Out of the flow's reach such a mover reads nonsense motion, and its moving
 * samples scatter in number as much as chance clusters of noise do; its footprint in the picture does not.
 *
 * <p><b>Footprints.</b> Three-frame differencing (common practice): a cell of {@code stride} × {@code stride}
 * pixels belongs to the middle frame's footprint when its mean absolute difference from the frame before and from
 * the frame after both exceed the change floor: something there was in the middle frame only. A mover that hops
 * leaves one footprint per frame where it was, whole; its place before and after each show in one difference
 * only. The change floor is {@link #NOISE_FACTOR} × the median cell difference of the region (sensor noise, and a
 * change of light over the whole picture), at least {@link #MIN_CHANGE}. Footprints are the 8-connected groups of
 * such cells inside the zone's bounding box plus {@link #MARGIN_PX}, from {@link #MIN_CELLS} to
 * {@link #MAX_CELLS} cells (larger bodies are the flow's); a frame with more than {@link #MAX_FOOTPRINTS} of them
 * (rain, a shaking camera) gives none.
 *
 * <p><b>Hops.</b> A chain of footprints is one mover when each step is beyond the flow's reach (at least
 * {@link MoverTracker#FAILED_JUMP_PX} and half the larger footprint's side), at most
 * {@link Jumps#MAX_JUMP_PX_PER_SECOND} × the time between the two frames, between footprints of half to twice
 * each other's size; when the footprint, moved back by the step (±{@link #SHIFT_SEARCH_PX}), finds its own pixels
 * in the frame before ({@link #SAME_BODY}: the same body, not another one that changed there); and, from the second
 * step on, when it lands where the last step's velocity puts it (within {@link #PREDICT_SHARE} of the step, at
 * least {@link #PREDICT_PX}). A chain must go on in every analysed frame. Once it has {@link #STEPS} steps it is
 * written out as a mover; its travel against the heading is the sum of its steps that end inside the zone, along
 * the against direction. Identical bright drops of heavy rain find themselves back in each other, so only the
 * steps' regularity stands against chance there: four steps rather than three cut chance movers in
 * {@code HopsTest}'s rain twelvefold.
 *
 * <p>Nothing is allocated per frame. Footprints lie on the previous analysed frame (the middle one), and are
 * timed by it.
 */
final class Hops {
    /** Cells of change looked for around the zone's samples, analysis pixels. */
    static final int MARGIN_PX = 32;
    /** Lowest change floor, grey levels of a cell's mean absolute difference. */
    static final double MIN_CHANGE = 10;
    /** Change floor over the region's median cell difference. */
    static final double NOISE_FACTOR = 3;
    /** Smallest footprint, cells (a single cell is noise). */
    static final int MIN_CELLS = 3;
    /** Largest footprint, cells (64 cells: 32 × 32 px at stride 4, which the flow's pyramid holds). */
    static final int MAX_CELLS = 64;
    /** More footprints than this in one frame: too busy to tell hops from chance. */
    static final int MAX_FOOTPRINTS = 24;
    /** Chains followed at once. */
    static final int CHAINS = 32;
    /** Chains written out as movers at once. */
    static final int OUT = 4;
    /** A step from the second on lands within this share of its length of where the chain's velocity puts it. */
    static final double PREDICT_SHARE = 0.35;
    /** … and within at least this many analysis pixels. */
    static final double PREDICT_PX = 6;
    /** A hop's footprint found back in the earlier frame differs there at most this share of its change. */
    static final double SAME_BODY = 0.6;
    /** Shifts tried around a hop's centroid step when finding its footprint back, ± analysis pixels. */
    static final int SHIFT_SEARCH_PX = 3;
    /** Steps alike before a chain is a mover. */
    static final int STEPS = 4;

    private final ZoneMask mask;
    private final int imageWidth;
    private final int stride;
    private final float againstX;
    private final float againstY;
    /** The region in cells: columns c0..c1−1, rows r0..r1−1. */
    private final int c0;
    private final int c1;
    private final int r0;
    private final int r1;
    private final int cols;
    /** The last frame (the middle one of the next three) and the one before it. */
    private byte[] previous;
    private byte[] older;
    /** Cell differences: last frame against the one before, and this frame against the last. */
    private int[] before;
    private int[] now;
    private final int[] histogram = new int[256];
    private final boolean[] marked;
    private final int[] stack;
    private double floorBefore;
    /** This frame's change floor, and the frame after the middle one (only during {@link #update}). */
    private double floor;
    private byte[] next;
    /** Frames seen since the last reset: 0 none, 1 one (no difference), 2 or more. */
    private int primed;
    private double tPrevious;
    private double tOlder;
    /** The cells of each footprint, from fStart[f], fn[f] of them (region cell indices). */
    private final int[] cellList;
    private final int[] fStart = new int[MAX_FOOTPRINTS + 1];

    private final double[] fx = new double[MAX_FOOTPRINTS + 1];
    private final double[] fy = new double[MAX_FOOTPRINTS + 1];
    private final int[] fn = new int[MAX_FOOTPRINTS + 1];
    private final int[] fw = new int[MAX_FOOTPRINTS + 1];
    private final int[] fh = new int[MAX_FOOTPRINTS + 1];
    private final boolean[] fTaken = new boolean[MAX_FOOTPRINTS + 1];
    private int footprints;

    private final boolean[] live = new boolean[CHAINS];
    private final long[] id = new long[CHAINS];
    private final int[] steps = new int[CHAINS];
    private final double[] x = new double[CHAINS];
    private final double[] y = new double[CHAINS];
    private final double[] t = new double[CHAINS];
    private final double[] vx = new double[CHAINS];
    private final double[] vy = new double[CHAINS];
    private final double[] born = new double[CHAINS];
    private final double[] travel = new double[CHAINS];
    private final double[] path = new double[CHAINS];
    private final int[] n = new int[CHAINS];
    private final int[] peak = new int[CHAINS];
    private final int[] w = new int[CHAINS];
    private final int[] h = new int[CHAINS];
    private final boolean[] extended = new boolean[CHAINS];
    private static final int COST_COLUMNS = MAX_FOOTPRINTS + 1;
    private final double[] costs = new double[CHAINS * COST_COLUMNS];
    /** Hop movers count down from −1, apart from the flow's tracks (1 up) and from 0 (none). */
    private long nextId = -1;

    /**
     * @param mask the zone's samples on a grid of {@code stride}
     * @param againstX the direction against the heading, image coordinates (y down); unit length
     */
    Hops(ZoneMask mask, int imageWidth, int imageHeight, int stride, float againstX, float againstY) {
        this.mask = mask;
        this.imageWidth = imageWidth;
        this.stride = stride;
        this.againstX = againstX;
        this.againstY = againstY;
        int minI = Integer.MAX_VALUE;
        int maxI = -1;
        int minJ = Integer.MAX_VALUE;
        int maxJ = -1;
        for (int k = 0; k < mask.size(); k++) {
            int p = mask.pixel(k);
            minI = Math.min(minI, p % mask.width);
            maxI = Math.max(maxI, p % mask.width);
            minJ = Math.min(minJ, p / mask.width);
            maxJ = Math.max(maxJ, p / mask.width);
        }
        int allCols = imageWidth / stride;
        int allRows = imageHeight / stride;
        int m = (MARGIN_PX + stride - 1) / stride;
        if (maxI < 0 || allCols < 1 || allRows < 1) {
            c0 = c1 = r0 = r1 = 0;
        } else {
            c0 = Math.max(0, minI - m);
            c1 = Math.min(allCols, maxI + m + 1);
            r0 = Math.max(0, minJ - m);
            r1 = Math.min(allRows, maxJ + m + 1);
        }
        cols = Math.max(0, c1 - c0);
        int cells = cols * Math.max(0, r1 - r0);
        previous = new byte[imageWidth * imageHeight];
        older = new byte[imageWidth * imageHeight];
        cellList = new int[cells];
        before = new int[cells];
        now = new int[cells];
        marked = new boolean[cells];
        stack = new int[cells];
    }

    /** Forgets the frames and every chain (the flow restarted after a gap). */
    void reset() {
        primed = 0;
        Arrays.fill(live, false);
    }

    /**
     * One analysed frame (grey, {@code imageWidth} × {@code imageHeight}, row-major) at stream second {@code time}.
     * Finds the footprints of the previous frame and extends the chains. {@code still}: the frame is known to show no change around the zone (the still-frame gate said so), so its
     * differences are taken as none without being worked out; no footprint can lie on a frame next to it, so every
     * chain ends, as it would.
     */
    void update(byte[] pixels, double time, boolean still) {
        if (pixels.length != previous.length) {
            throw new IllegalArgumentException("pixels: " + pixels.length + " (expected " + previous.length + ")");
        }
        int[] swap = before;
        before = now;
        now = swap;
        double floorNow;
        if (still) {
            Arrays.fill(now, 0);
            floorNow = floorBefore;
        } else {
            floorNow = primed > 0 ? differences(pixels) : 0;
        }
        if (primed == 2) {
            floor = Math.max(floorBefore, floorNow);
            next = pixels;
            footprints(floor);
            // a chain not extended on the frame before the middle one cannot be compared with it: it ends
            for (int c = 0; c < CHAINS; c++) {
                if (live[c] && t[c] != tOlder) {
                    live[c] = false;
                }
                extended[c] = false;
            }
            if (footprints <= MAX_FOOTPRINTS) {
                follow(tPrevious);
            }
            next = null;
        } else {
            primed++;
        }
        floorBefore = floorNow;
        byte[] b = older;
        older = previous;
        previous = b;
        System.arraycopy(pixels, 0, previous, 0, pixels.length);
        tOlder = tPrevious;
        tPrevious = time;
    }

    /** Fills {@link #now} with each cell's mean absolute difference; returns the change floor. */
    private double differences(byte[] pixels) {
        Arrays.fill(histogram, 0);
        final int area = stride * stride;
        for (int r = r0; r < r1; r++) {
            for (int c = c0; c < c1; c++) {
                int sum = 0;
                for (int yy = r * stride; yy < (r + 1) * stride; yy++) {
                    int base = yy * imageWidth + c * stride;
                    for (int xx = 0; xx < stride; xx++) {
                        sum += Math.abs((pixels[base + xx] & 0xff) - (previous[base + xx] & 0xff));
                    }
                }
                int mean = sum / area;
                now[(r - r0) * cols + (c - c0)] = mean;
                histogram[mean]++;
            }
        }
        int half = (now.length + 1) / 2;
        int median = 0;
        for (int acc = 0; median < 255; median++) {
            acc += histogram[median];
            if (acc >= half) {
                break;
            }
        }
        return Math.max(MIN_CHANGE, NOISE_FACTOR * median);
    }

    /** The 8-connected groups of cells changed in both differences; counts past MAX_FOOTPRINTS stop early. */
    private void footprints(double floor) {
        final int rows = r1 - r0;
        for (int i = 0; i < marked.length; i++) {
            marked[i] = before[i] > floor && now[i] > floor;
        }
        footprints = 0;
        int used = 0;
        for (int s = 0; s < marked.length; s++) {
            if (!marked[s]) {
                continue;
            }
            int top = 0;
            stack[top++] = s;
            marked[s] = false;
            int count = 0;
            long sx = 0;
            long sy = 0;
            int minC = Integer.MAX_VALUE;
            int maxC = -1;
            int minR = Integer.MAX_VALUE;
            int maxR = -1;
            while (top > 0) {
                int k = stack[--top];
                cellList[used + count] = k;
                int cc = k % cols;
                int rr = k / cols;
                count++;
                sx += cc;
                sy += rr;
                minC = Math.min(minC, cc);
                maxC = Math.max(maxC, cc);
                minR = Math.min(minR, rr);
                maxR = Math.max(maxR, rr);
                for (int dr = -1; dr <= 1; dr++) {
                    int nr = rr + dr;
                    if (nr < 0 || nr >= rows) {
                        continue;
                    }
                    for (int dc = -1; dc <= 1; dc++) {
                        int nc = cc + dc;
                        if (nc < 0 || nc >= cols) {
                            continue;
                        }
                        int q = nr * cols + nc;
                        if (marked[q]) {
                            marked[q] = false;
                            stack[top++] = q;
                        }
                    }
                }
            }
            if (count < MIN_CELLS || count > MAX_CELLS) {
                continue;
            }
            if (footprints == MAX_FOOTPRINTS) {
                footprints++; // too busy: the caller gives up on this frame
                return;
            }
            int f = footprints++;
            fStart[f] = used;
            used += count;
            fx[f] = ((double) sx / count + c0) * stride + stride / 2.0;
            fy[f] = ((double) sy / count + r0) * stride + stride / 2.0;
            fn[f] = count;
            fw[f] = (maxC - minC + 1) * stride;
            fh[f] = (maxR - minR + 1) * stride;
        }
    }

    /** Pairs chains with this frame's footprints (nearest to the prediction first) and starts new chains. */
    private void follow(double time) {
        Arrays.fill(fTaken, 0, footprints, false);
        // each pairing's cost once (the picture test is the dear part), then nearest first
        for (int c = 0; c < CHAINS; c++) {
            for (int f = 0; f < footprints; f++) {
                costs[c * COST_COLUMNS + f] = live[c] && time > t[c] ? cost(c, f, time) : Double.MAX_VALUE;
            }
        }
        while (true) {
            int bestC = -1;
            int bestF = -1;
            double best = Double.MAX_VALUE;
            for (int c = 0; c < CHAINS; c++) {
                if (extended[c]) {
                    continue;
                }
                for (int f = 0; f < footprints; f++) {
                    double cost = costs[c * COST_COLUMNS + f];
                    if (!fTaken[f] && cost < best) {
                        best = cost;
                        bestC = c;
                        bestF = f;
                    }
                }
            }
            if (bestC < 0) {
                break;
            }
            extend(bestC, bestF, time);
            fTaken[bestF] = true;
        }
        for (int f = 0; f < footprints; f++) {
            if (fTaken[f]) {
                continue;
            }
            int c = free();
            if (c < 0) {
                break;
            }
            live[c] = true;
            extended[c] = true;
            id[c] = nextId--;
            steps[c] = 0;
            x[c] = fx[f];
            y[c] = fy[f];
            t[c] = time;
            born[c] = time;
            vx[c] = 0;
            vy[c] = 0;
            travel[c] = 0;
            path[c] = 0;
            n[c] = fn[f];
            peak[c] = fn[f];
            w[c] = fw[f];
            h[c] = fh[f];
        }
    }

    /** How badly footprint f continues chain c (distance from its prediction); MAX_VALUE: it cannot. */
    private double cost(int c, int f, double time) {
        if (fn[f] < 0.5 * n[c] || fn[f] > 2.0 * n[c]) {
            return Double.MAX_VALUE;
        }
        double since = time - t[c];
        double dx = fx[f] - x[c];
        double dy = fy[f] - y[c];
        double step = Math.hypot(dx, dy);
        double side = Math.max(Math.max(fw[f], fh[f]), Math.max(w[c], h[c]));
        if (step < MoverTracker.FAILED_JUMP_PX || step < 0.5 * side
                || step > Jumps.MAX_JUMP_PX_PER_SECOND * since + PREDICT_PX) {
            return Double.MAX_VALUE;
        }
        double off = step;
        if (steps[c] > 0) {
            double px = x[c] + vx[c] * since;
            double py = y[c] + vy[c] * since;
            off = Math.hypot(fx[f] - px, fy[f] - py);
            if (off > Math.max(PREDICT_PX, PREDICT_SHARE * Math.hypot(vx[c], vy[c]) * since)) {
                return Double.MAX_VALUE;
            }
        }
        return sameBody(f, dx, dy) ? off : Double.MAX_VALUE;
    }

    /**
     * True when footprint f, moved back by (dx, dy), finds its own pixels in the frame before the middle one:
     * their mean absolute difference there is at most {@link #SAME_BODY} of their difference from that frame
     * where they are (which exceeds the change floor, or they would not be a footprint).
     */
    private boolean sameBody(int f, double dx, double dy) {
        final int still = difference(f, 0, 0);
        int moved = Integer.MAX_VALUE;
        final int bx = (int) Math.round(dx);
        final int by = (int) Math.round(dy);
        for (int sy = by - SHIFT_SEARCH_PX; sy <= by + SHIFT_SEARCH_PX; sy++) {
            for (int sx = bx - SHIFT_SEARCH_PX; sx <= bx + SHIFT_SEARCH_PX; sx++) {
                moved = Math.min(moved, difference(f, sx, sy));
            }
        }
        return moved <= SAME_BODY * still;
    }

    /**
     * Sum of absolute differences between footprint f's own pixels in the middle frame and the frame before, moved
     * by (sx, sy). Its own pixels: those of its cells that differ by more than the change floor from both the frame
     * before and the frame after (the ground inside its cells is left out: moved, it would not match).
     */
    private int difference(int f, int sx, int sy) {
        final int height = previous.length / imageWidth;
        final int limit = (int) floor;
        int sum = 0;
        for (int i = fStart[f]; i < fStart[f] + fn[f]; i++) {
            int k = cellList[i];
            int cx = (k % cols + c0) * stride;
            int cy = (k / cols + r0) * stride;
            for (int yy = cy; yy < cy + stride; yy++) {
                int oy = Math.min(height - 1, Math.max(0, yy - sy));
                for (int xx = cx; xx < cx + stride; xx++) {
                    int p = yy * imageWidth + xx;
                    int a = previous[p] & 0xff;
                    if (Math.abs(a - (older[p] & 0xff)) <= limit || Math.abs(a - (next[p] & 0xff)) <= limit) {
                        continue;
                    }
                    int ox = Math.min(imageWidth - 1, Math.max(0, xx - sx));
                    sum += Math.abs(a - (older[oy * imageWidth + ox] & 0xff));
                }
            }
        }
        return sum;
    }

    private void extend(int c, int f, double time) {
        double since = time - t[c];
        double dx = fx[f] - x[c];
        double dy = fy[f] - y[c];
        if (mask.contains((int) Math.floor(fx[f] / stride), (int) Math.floor(fy[f] / stride))) {
            travel[c] += dx * againstX + dy * againstY;
        }
        path[c] += Math.hypot(dx, dy);
        vx[c] = dx / since;
        vy[c] = dy / since;
        x[c] = fx[f];
        y[c] = fy[f];
        t[c] = time;
        n[c] = fn[f];
        peak[c] = Math.max(peak[c], fn[f]);
        w[c] = fw[f];
        h[c] = fh[f];
        steps[c]++;
        extended[c] = true;
    }

    private int free() {
        for (int c = 0; c < CHAINS; c++) {
            if (!live[c]) {
                return c;
            }
        }
        return -1;
    }

    /** Writes the chains with {@link #STEPS} steps or more into {@code out} (between begin and end). */
    void write(Movers out) {
        int written = 0;
        for (int c = 0; c < CHAINS && written < OUT; c++) {
            if (!live[c] || steps[c] < STEPS) {
                continue;
            }
            double age = t[c] - born[c];
            double speed = age > 0 ? path[c] / age : 0;
            if (out.put(id[c], extended[c], age, travel[c], extended[c] ? n[c] : 0, peak[c], w[c], h[c], x[c], y[c],
                    vx[c], vy[c], speed) >= 0) {
                written++;
            }
        }
    }
}
