package wayward.zone;

import java.util.Arrays;

/**
 * The movers of one zone after one analysed frame: per followed track its size, position, velocity, age and
 * travel against the heading, and a short path. A mutable table of fixed capacity, filled by
 * {@link MoverTracker#update} (or, in {@code what-if}, from a replay report's records) and read by the
 * wrong-way rule on the same thread. Slots are reused; a slot's id says which track it holds.
 *
 * <p>Units: analysis pixels, stream seconds, px/s. The path keeps up to {@link #PATH_POINTS} centroid points
 * over the track's whole life: one per frame in which the track was seen, thinned to every other point (and
 * from then on every second frame, then every fourth, …) whenever it is full, so its first point is always
 * where the track began. Per track the table also tallies, over the frames it was put in, how often it was seen,
 * how much its sample count varies ({@link #sampleSpread}) and how far its travel ever fell back
 * ({@link #travelDropPx}): the rule tells a steady body from chance clusters by them. Nothing is allocated per
 * frame, except by {@link #pathFractions} (for an event).
 */
public final class Movers {
    /** Most points a path keeps. */
    public static final int PATH_POINTS = 16;

    /** Stream time of the frame, seconds. */
    public double streamSeconds;
    /** Size of the analysed picture and the flow's sample spacing, pixels. */
    public int imageWidth;
    public int imageHeight;
    public int stride = 1;

    private final long[] id;
    private final boolean[] live;
    private final boolean[] touched;
    private final boolean[] seen;
    private final double[] age;
    private final double[] travel;
    private final int[] samples;
    private final int[] peakSamples;
    private final int[] width;
    private final int[] height;
    private final double[] x;
    private final double[] y;
    private final double[] vx;
    private final double[] vy;
    private final double[] speed;
    private final double[] stillAhead;
    private final float[] pathX;
    private final float[] pathY;
    private final int[] pathCount;
    private final int[] pathStep;
    private final int[] pathTick;
    private final int[] frames;
    private final int[] seenFrames;
    private final double[] sampleSum;
    private final double[] sampleSquares;
    private final double[] travelPeak;
    private final double[] travelDrop;

    public Movers(int capacity) {
        if (capacity < 1) {
            throw new IllegalArgumentException("capacity: " + capacity + " (expected 1 or more)");
        }
        id = new long[capacity];
        live = new boolean[capacity];
        touched = new boolean[capacity];
        seen = new boolean[capacity];
        age = new double[capacity];
        travel = new double[capacity];
        samples = new int[capacity];
        peakSamples = new int[capacity];
        width = new int[capacity];
        height = new int[capacity];
        x = new double[capacity];
        y = new double[capacity];
        vx = new double[capacity];
        vy = new double[capacity];
        speed = new double[capacity];
        stillAhead = new double[capacity];
        pathX = new float[capacity * PATH_POINTS];
        pathY = new float[capacity * PATH_POINTS];
        pathCount = new int[capacity];
        pathStep = new int[capacity];
        pathTick = new int[capacity];
        frames = new int[capacity];
        seenFrames = new int[capacity];
        sampleSum = new double[capacity];
        sampleSquares = new double[capacity];
        travelPeak = new double[capacity];
        travelDrop = new double[capacity];
    }

    public int capacity() {
        return id.length;
    }

    /** Starts a frame: every track not {@link #put} before {@link #end} is gone. */
    public void begin(double streamSeconds, int imageWidth, int imageHeight, int stride) {
        this.streamSeconds = streamSeconds;
        this.imageWidth = imageWidth;
        this.imageHeight = imageHeight;
        this.stride = stride;
        Arrays.fill(touched, false);
    }

    /**
     * One track's state in this frame.
     *
     * @param seen        the track found its group in this frame (false: predicted through a missed frame)
     * @param ageSeconds  stream seconds since the track began
     * @param travelPx    integrated travel against the heading, analysis pixels (with-heading motion subtracts)
     * @param samples     moving samples of its group in this frame (0 when not seen)
     * @param peakSamples most moving samples it had in any frame
     * @param x           centroid, analysis pixels
     * @param vx          velocity, px/s (x right, y down)
     * @param speed       mean speed over the frames it was seen, px/s
     * @return the slot, or -1 when the table is full
     */
    public int put(long trackId, boolean seen, double ageSeconds, double travelPx, int samples, int peakSamples,
            int widthPx, int heightPx, double x, double y, double vx, double vy, double speed) {
        int k = slotOf(trackId);
        if (k < 0) {
            for (int i = 0; i < id.length; i++) {
                if (!live[i]) {
                    k = i;
                    break;
                }
            }
            if (k < 0) {
                return -1;
            }
            live[k] = true;
            id[k] = trackId;
            pathCount[k] = 0;
            pathStep[k] = 1;
            pathTick[k] = 0;
            frames[k] = 0;
            seenFrames[k] = 0;
            sampleSum[k] = 0;
            sampleSquares[k] = 0;
            travelPeak[k] = travelPx;
            travelDrop[k] = 0;
        }
        touched[k] = true;
        frames[k]++;
        travelPeak[k] = Math.max(travelPeak[k], travelPx);
        travelDrop[k] = Math.max(travelDrop[k], travelPeak[k] - travelPx);
        if (seen) {
            seenFrames[k]++;
            sampleSum[k] += samples;
            sampleSquares[k] += (double) samples * samples;
        }
        this.seen[k] = seen;
        this.age[k] = ageSeconds;
        this.travel[k] = travelPx;
        this.samples[k] = samples;
        this.peakSamples[k] = peakSamples;
        this.width[k] = widthPx;
        this.height[k] = heightPx;
        this.x[k] = x;
        this.y[k] = y;
        this.vx[k] = vx;
        this.vy[k] = vy;
        this.speed[k] = speed;
        this.stillAhead[k] = Double.POSITIVE_INFINITY;
        if (seen) {
            addPathPoint(k, (float) x, (float) y);
        }
        return k;
    }

    private void addPathPoint(int k, float px, float py) {
        final int base = k * PATH_POINTS;
        if (pathTick[k]++ % pathStep[k] != 0) {
            return;
        }
        if (pathCount[k] == PATH_POINTS) {
            // thin to every other point; the first stays
            for (int i = 1; i < PATH_POINTS / 2; i++) {
                pathX[base + i] = pathX[base + 2 * i];
                pathY[base + i] = pathY[base + 2 * i];
            }
            pathCount[k] = PATH_POINTS / 2;
            pathStep[k] *= 2;
            pathTick[k] = 1;
        }
        pathX[base + pathCount[k]] = px;
        pathY[base + pathCount[k]] = py;
        pathCount[k]++;
    }

    /** Ends a frame: tracks not put since {@link #begin} are dropped. */
    public void end() {
        for (int i = 0; i < id.length; i++) {
            if (live[i] && !touched[i]) {
                live[i] = false;
            }
        }
    }

    /** Empties the table (a restart of the flow). */
    public void clear() {
        Arrays.fill(live, false);
    }

    private int slotOf(long trackId) {
        for (int i = 0; i < id.length; i++) {
            if (live[i] && id[i] == trackId) {
                return i;
            }
        }
        return -1;
    }

    /** Live tracks. */
    public int count() {
        int n = 0;
        for (boolean b : live) {
            n += b ? 1 : 0;
        }
        return n;
    }

    /** The largest travel against the heading among live tracks, px; 0 when there are none. */
    public double largestTravelPx() {
        double best = 0;
        for (int i = 0; i < id.length; i++) {
            if (live[i] && travel[i] > best) {
                best = travel[i];
            }
        }
        return best;
    }

    public boolean live(int k) {
        return live[k];
    }

    public long id(int k) {
        return id[k];
    }

    public boolean seen(int k) {
        return seen[k];
    }

    public double ageSeconds(int k) {
        return age[k];
    }

    public double travelPx(int k) {
        return travel[k];
    }

    public int samples(int k) {
        return samples[k];
    }

    public int peakSamples(int k) {
        return peakSamples[k];
    }

    /** The most moving samples the track ever had, as analysis pixels² (samples × stride²). */
    public double peakAreaPx(int k) {
        return (double) peakSamples[k] * stride * stride;
    }

    public int widthPx(int k) {
        return width[k];
    }

    public int heightPx(int k) {
        return height[k];
    }

    public double x(int k) {
        return x[k];
    }

    public double y(int k) {
        return y[k];
    }

    public double vx(int k) {
        return vx[k];
    }

    public double vy(int k) {
        return vy[k];
    }

    public double speed(int k) {
        return speed[k];
    }

    /**
     * How far ahead of the track's centroid, along its motion, the nearest still and textured sample lies, analysis
     * pixels; {@link Double#POSITIVE_INFINITY} when none was found within the tracker's look-ahead or the track was
     * not seen in this frame. Still ground between two movers tells them apart: one body has none inside it.
     */
    public double stillAheadPx(int k) {
        return stillAhead[k];
    }

    /** Sets {@link #stillAheadPx} of slot k (after {@link #put}, which resets it to infinity). */
    public void stillAheadPx(int k, double px) {
        stillAhead[k] = px;
    }

    /** Frames the track was put in since it entered this table, seen or not. */
    public int frames(int k) {
        return frames[k];
    }

    /** Frames in which the track was seen since it entered this table. */
    public int seenFrames(int k) {
        return seenFrames[k];
    }

    /**
     * How much the track's moving-sample count varies between the frames it was seen in: standard deviation over
     * mean (0: the same every time); {@link Double#POSITIVE_INFINITY} before it was seen with any sample.
     */
    public double sampleSpread(int k) {
        if (seenFrames[k] == 0 || sampleSum[k] <= 0) {
            return Double.POSITIVE_INFINITY;
        }
        double mean = sampleSum[k] / seenFrames[k];
        double variance = Math.max(0, sampleSquares[k] / seenFrames[k] - mean * mean);
        return Math.sqrt(variance) / mean;
    }

    /** The most the track's travel against the heading ever fell back from its highest point, px (0: never). */
    public double travelDropPx(int k) {
        return travelDrop[k];
    }

    /** The slot of a live track, or -1. */
    public int slot(long trackId) {
        return slotOf(trackId);
    }

    public int pathCount(int k) {
        return pathCount[k];
    }

    public double pathX(int k, int i) {
        return pathX[k * PATH_POINTS + i];
    }

    public double pathY(int k, int i) {
        return pathY[k * PATH_POINTS + i];
    }

    /**
     * The track's path as picture fractions (0..1), x and y interleaved, its latest centroid last; at most
     * {@code maxPoints} points evenly picked from the kept ones, the first and the latest included. Allocates.
     */
    public double[] pathFractions(int k, int maxPoints) {
        double[] out = new double[2 * maxPoints];
        int m = pathFractions(k, maxPoints, out);
        return m == maxPoints ? out : Arrays.copyOf(out, 2 * m);
    }

    /** As {@link #pathFractions(int, int)}, into {@code out} (at least 2 × maxPoints long); returns the points. */
    public int pathFractions(int k, int maxPoints, double[] out) {
        int n = pathCount[k];
        double lastX = x[k];
        double lastY = y[k];
        boolean addLast = n == 0 || pathX(k, n - 1) != lastX || pathY(k, n - 1) != lastY;
        int total = n + (addLast ? 1 : 0);
        int m = Math.max(1, Math.min(maxPoints, total));
        double w = Math.max(1, imageWidth);
        double h = Math.max(1, imageHeight);
        for (int j = 0; j < m; j++) {
            int i = m == 1 ? total - 1 : (int) Math.round(j * (total - 1) / (double) (m - 1));
            double px = i < n ? pathX(k, i) : lastX;
            double py = i < n ? pathY(k, i) : lastY;
            out[2 * j] = Math.max(0, Math.min(1, px / w));
            out[2 * j + 1] = Math.max(0, Math.min(1, py / h));
        }
        return m;
    }
}
