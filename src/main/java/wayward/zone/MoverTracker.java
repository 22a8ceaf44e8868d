package wayward.zone;

import java.util.Arrays;
import wayward.flow.FlowField;

/**
 * Finds the movers of one zone in each flow field and follows them from frame to frame. A mover is a coherent
 * group of moving samples: connected on the sample grid (8-neighbourhood, one sample of gap allowed, so a
 * mover whose middle is flat still hangs together) and moving alike (each sample within
 * {@link MoverSettings#groupAngleDeg} of its group's direction). Groups are seeded by the zone's samples and
 * grown over the whole picture, so a vehicle beside the zone that spills a sliver into it is seen whole; its
 * travel only counts while its centroid is inside the zone (the same test as the suite's ground truth: a
 * mover's centre inside the zone). Each track keeps its age, size, a short path, its mean speed and its
 * <em>travel against the heading</em>: the sum over frames of its group's motion along the against direction
 * (with-heading motion subtracts, crossing adds nothing). That sum comes from the flow inside the group, not
 * from the centroid, so a mover that shrinks as it drives away, or whose outline changes, still adds up its
 * true travel. Where the flow fails (a small mover jumping tens of pixels a frame), the centroid's steps count
 * instead, but only while the group keeps its size and shape, has at least {@link #MIN_STEADY_SAMPLES} samples
 * and its flow goes the same way at the speed floor; the travel is the larger of the two sums.
 *
 * <p><b>What moves.</b> The picture's common motion is subtracted first when the camera's motion is removed.
 * A sample whose structure tensor's smaller eigenvalue reaches the confidence floor votes with its flow. One
 * below that floor whose larger eigenvalue reaches it lies on a straight edge, where only the motion across the
 * edge is measured (the aperture problem): it votes with its normal flow s·n, s = (u, v)·n. A plain van's roof
 * only shows its motion at its rim, and those rim samples are what makes it a mover. A sample with neither
 * does not move. The group's velocity is the least-squares velocity of all its constraints: a full sample
 * says V = (u, v), an edge sample says V·n = s (the intersection of constraints of Adelson &amp; Movshon 1982),
 * lightly regularised so that a group of parallel edges alone reads its motion across them.
 *
 * <p><b>Slow movers.</b> A crawl of half a pixel per analysed frame is below the speed floor, and lowering the
 * floor lets sensor noise through. Instead every sample keeps an exponential average of its vote (time
 * constant {@link MoverSettings#slowSeconds}, in stream time): noise, which changes sign from frame to frame,
 * averages towards 0 (its spread shrinks by about √(α / (2 − α)), a quarter at 0.75 s and 10 frames a second),
 * while a steady crawl keeps its value. A sample also moves when its averaged flow reaches the slow floor and its
 * present flow agrees with the average (its projection on the average is at least half the average's length):
 * the agreement test keeps the decaying average behind a fast mover that has passed from reading as a trail.
 * This was chosen over integrating along tracks because noise alone then never forms the groups that tracks
 * would have to follow.
 *
 * <p><b>Following.</b> Each track predicts its centroid (last centroid + velocity × time since seen); groups
 * and tracks are paired nearest first within a gate (gate + half the track's size, or the prediction inside the
 * group's box), never when both move clearly and in opposite directions. An unpaired group of at least two
 * samples starts a track; a track that finds no group for {@link MoverSettings#lostSeconds} is dropped. A track
 * whose flow reading fails on a jump it predicted ({@link #FAILED_JUMP_PX} or more) while its group turns up
 * where it should goes on with its centroid's velocity and step (see {@code flowFailed}).
 *
 * <p><b>Still ground ahead.</b> For each seen track the tracker also looks along its motion for the nearest
 * still, textured sample ({@link Movers#stillAheadPx}): the wrong-way rule tells two vehicles nose to tail (still
 * ground between them) from the front and back of one plain vehicle (nothing, or its moving inside, between).
 *
 * <p>One instance per zone, used by the camera's analysis thread. Every array is sized at construction from the
 * sample grid (groups may grow past the zone) and the track table from the zone mask's sample count;
 * {@link #update} allocates nothing. A test-side check of the allocation is not there yet (JMH -prof gc).
 */
public final class MoverTracker {
    /** Groups smaller than this are not followed (single noisy samples). */
    static final int MIN_GROUP_SAMPLES = 2;
    /** Groups smaller than this never count centroid steps as travel (chance clusters of noise are small). */
    static final int MIN_STEADY_SAMPLES = 6;
    /**
     * Predicted jump between two analysed frames, analysis pixels, from which a flow reading against the track is
     * taken for a failure of the flow rather than a change of the mover's course: two grid steps at the default
     * stride, about where the pyramid stops holding an object of a dozen pixels (the object-motion benchmark's
     * small objects lose most of their catch at 6–8 px).
     */
    static final double FAILED_JUMP_PX = 8;
    /**
     * Fastest jump a track follows from centroid to centroid when no group turned up near its prediction,
     * analysis pixels per second: one and a half times a 320-pixel picture's width a second.
     */
    static final double MAX_JUMP_PX_PER_SECOND = 480;
    /** Jumps alike in a row before a run of jumps counts as travel. */
    static final int JUMPS_ALIKE = 3;
    /** Tracks followed at once at most; at least 4, otherwise a quarter of the zone's samples. */
    static final int MAX_TRACKS = 64;
    /** How far ahead of a track's centroid still ground is looked for, analysis pixels. */
    static final double LOOK_AHEAD_PX = 160;

    private final ZoneMask mask;
    private final MoverSettings settings;
    private final int gridWidth;
    private final int gridHeight;
    private final int imageWidth;
    private final int imageHeight;
    private final int stride;
    private final boolean hasHeading;
    private final float againstX;
    private final float againstY;
    private final float cosTolerance;
    private final float cosGroup;

    private final MoverGroups gr;
    private final int[] gTrack;
    // per track
    private final long[] tId;
    private final boolean[] tLive;
    private final double[] tBorn;
    private final double[] tSeenAt;
    private final double[] tX;
    private final double[] tY;
    private final double[] tVx;
    private final double[] tVy;
    private final double[] tTravel;
    private final double[] tFlowTravel;
    private final double[] tCentroidTravel;
    /** The centroid where it was last seen inside the zone (NaN: not yet). */
    private final double[] tEntryX;
    private final double[] tEntryY;
    private final double[] tPredVx;
    private final double[] tPredVy;
    private final double[] tDistance;
    private final double[] tMovingSeconds;
    private final int[] tSamples;
    private final int[] tPeak;
    private final int[] tW;
    private final int[] tH;
    private final int[] tGroup;
    /** The track's group was found by a jump this frame (see {@code jump}). */
    private final boolean[] tJumped;
    /** Where and when the track's run of jumps began (its centroid before the first), and how many in a row. */
    private final double[] tJumpX;
    private final double[] tJumpY;
    private final double[] tJumpT;
    private final int[] tJumps;
    private long nextId = 1;
    private long untracked;

    /**
     * @param mask       the zone's samples, made for {@code layout}
     * @param layout     a field of the size and sample spacing the tracker will see; read, not kept
     * @param headingDeg permitted bearing, degrees clockwise from image-up; NaN: no travel is counted
     */
    public MoverTracker(ZoneMask mask, FlowField layout, double headingDeg, MoverSettings settings,
            boolean removeCameraMotion) {
        if (layout.width != mask.width || layout.height != mask.height) {
            throw new IllegalArgumentException("layout: " + layout.width + "x" + layout.height + " samples (expected "
                    + mask.width + "x" + mask.height + ", the mask's)");
        }
        if (!Double.isNaN(headingDeg) && !(headingDeg >= 0 && headingDeg < 360)) {
            throw new IllegalArgumentException("headingDeg: " + headingDeg + " (expected 0 to less than 360, or NaN)");
        }
        this.mask = mask;
        this.settings = settings;
        this.gridWidth = mask.width;
        this.gridHeight = mask.height;
        this.imageWidth = layout.imageWidth;
        this.imageHeight = layout.imageHeight;
        this.stride = layout.stride;
        this.hasHeading = !Double.isNaN(headingDeg);
        double h = Math.toRadians(hasHeading ? headingDeg : 0);
        // the heading is (sin h, −cos h) in image coordinates (y down); against is its opposite
        this.againstX = (float) -Math.sin(h);
        this.againstY = (float) Math.cos(h);
        this.cosTolerance = (float) Math.cos(Math.toRadians(settings.toleranceDeg()));
        this.cosGroup = (float) Math.cos(Math.toRadians(settings.groupAngleDeg()));
        gr = new MoverGroups(mask, layout, settings, removeCameraMotion);
        int n = gridWidth * gridHeight;
        gTrack = new int[n];
        int t = capacity(gr.zoneSamples());
        tId = new long[t];
        tLive = new boolean[t];
        tBorn = new double[t];
        tSeenAt = new double[t];
        tX = new double[t];
        tY = new double[t];
        tVx = new double[t];
        tVy = new double[t];
        tTravel = new double[t];
        tFlowTravel = new double[t];
        tEntryX = new double[t];
        tCentroidTravel = new double[t];
        tEntryY = new double[t];
        tPredVx = new double[t];
        tPredVy = new double[t];
        tDistance = new double[t];
        tMovingSeconds = new double[t];
        tSamples = new int[t];
        tPeak = new int[t];
        tW = new int[t];
        tH = new int[t];
        tGroup = new int[t];
        tJumped = new boolean[t];
        tJumpX = new double[t];
        tJumpY = new double[t];
        tJumpT = new double[t];
        tJumps = new int[t];
    }

    /** Tracks followed at once at most for a zone of {@code samples} samples. */
    static int capacity(int samples) {
        return Math.max(4, Math.min(MAX_TRACKS, samples / 4));
    }

    /** A table the size of this tracker's track capacity, for {@link #update}. */
    public Movers newMovers() {
        return new Movers(tId.length);
    }

    public ZoneMask mask() {
        return mask;
    }

    /** Groups that could not be followed because every track slot was taken, since the start. */
    public long untracked() {
        return untracked;
    }

    /** Forgets every track and the averaged flow (the flow restarted after a gap). */
    public void reset() {
        Arrays.fill(tLive, false);
        gr.reset();
    }

    /**
     * Finds this frame's groups, follows the tracks and writes them into {@code out}.
     *
     * @param flow         a field of the layout given at construction
     * @param frameSeconds stream seconds between the flow's two frames (more than 0)
     * @param out          a table from {@link #newMovers}; refilled
     */
    public void update(FlowField flow, double frameSeconds, double streamSeconds, Movers out) {
        if (flow.width != gridWidth || flow.height != gridHeight || flow.stride != stride) {
            throw new IllegalArgumentException("flow: " + flow.width + "x" + flow.height + " every " + flow.stride
                    + " px (expected " + gridWidth + "x" + gridHeight + " every " + stride + " px)");
        }
        if (!(frameSeconds > 0)) {
            throw new IllegalArgumentException("frameSeconds: " + frameSeconds + " (expected more than 0)");
        }
        if (out.capacity() != tId.length) {
            throw new IllegalArgumentException("out: capacity " + out.capacity() + " (expected " + tId.length + ")");
        }
        gr.find(flow, frameSeconds);
        follow(frameSeconds, streamSeconds);
        out.begin(streamSeconds, imageWidth, imageHeight, stride);
        for (int t = 0; t < tId.length; t++) {
            if (!tLive[t]) {
                continue;
            }
            boolean seen = tSeenAt[t] == streamSeconds;
            double speed = tMovingSeconds[t] > 0 ? tDistance[t] / tMovingSeconds[t] : 0;
            int slot = out.put(tId[t], seen, streamSeconds - tBorn[t], tTravel[t], seen ? tSamples[t] : 0, tPeak[t],
                    tW[t], tH[t], tX[t], tY[t], tVx[t], tVy[t], speed);
            if (seen && slot >= 0) {
                out.stillAheadPx(slot, stillAhead(t));
            }
        }
        out.end();
    }

    /**
     * Distance from track t's centroid, along its velocity, to the first still textured sample, analysis pixels
     * (half-stride steps, nearest sample); infinity when the look-ahead reaches the picture's edge or
     * {@link #LOOK_AHEAD_PX} first, or the track does not move.
     */
    private double stillAhead(int t) {
        final double speed = Math.hypot(tVx[t], tVy[t]);
        if (!(speed > 0)) {
            return Double.POSITIVE_INFINITY;
        }
        final double ux = tVx[t] / speed;
        final double uy = tVy[t] / speed;
        final double step = 0.5 * stride;
        for (double d = step; d <= LOOK_AHEAD_PX; d += step) {
            final int k = gr.sampleAt(tX[t] + ux * d, tY[t] + uy * d);
            if (k < 0) {
                break;
            }
            if (gr.kind[k] == MoverGroups.STILL) {
                return d;
            }
        }
        return Double.POSITIVE_INFINITY;
    }

    /** The group keeps the track's size and shape: samples within 0.6–1.6×, box sides within 8 px or a half. */
    private boolean steady(int k, int g) {
        final int n = gr.count[g];
        final int w = (gr.maxI[g] - gr.minI[g] + 1) * stride;
        final int h = (gr.maxJ[g] - gr.minJ[g] + 1) * stride;
        return n >= 0.6 * tSamples[k] && n <= 1.6 * tSamples[k]
                && Math.abs(w - tW[k]) <= Math.max(8, 0.5 * tW[k]) && Math.abs(h - tH[k]) <= Math.max(8, 0.5 * tH[k]);
    }

    /**
     * True when group g, paired with track k, reads a motion the track cannot have made although its centroid
     * went on the track's way: the flow failed on a jump larger than it can measure (a small mover crossing tens
     * of pixels between two analysed frames, which alternate between one and two video frames apart) and read
     * the wrong motion, while the mover itself is where it should be. Needs a track seen in the previous
     * analysed frame whose velocity predicts a jump of at least {@link #FAILED_JUMP_PX}, a flow reading less than
     * half that velocity along it, and a centroid step along the track's way between a quarter and one and a
     * half of the predicted jump (plus a stride): where it should be, not a large group whose outline changed.
     */
    private boolean flowFailed(int k, int g, double cx, double cy, double dt, double t) {
        if (Double.isNaN(tSeenAt[k]) || Math.abs(tSeenAt[k] - (t - dt)) > 1e-6 || gr.count[g] < MIN_STEADY_SAMPLES) {
            return false;
        }
        final double tvx = tVx[k];
        final double tvy = tVy[k];
        final double speed = Math.sqrt(tvx * tvx + tvy * tvy);
        final double predicted = speed * dt;
        if (!(predicted >= FAILED_JUMP_PX)) {
            return false;
        }
        final double flowAlong = (gr.vu[g] * tvx + gr.vv[g] * tvy) / (dt * speed);
        final double stepAlong = ((cx - tX[k]) * tvx + (cy - tY[k]) * tvy) / speed;
        return flowAlong < 0.5 * speed && stepAlong >= 0.25 * predicted && stepAlong <= 1.5 * predicted + stride;
    }

    /**
     * Follows small movers out of the flow's reach by their jumps. A mover crossing tens of pixels between analysed
     * frames reads nonsense flow, so its group turns up far from the prediction made from that flow. Groups no
     * track claimed pair with tracks no group claimed when the track can have jumped there ({@code jumpsTo}), at
     * most {@link #MAX_JUMP_PX_PER_SECOND} × the time since it was seen (plus the gate and half the larger box)
     * away, within {@link MoverSettings#lostSeconds}; nearest first. A track already jumping that was paired where
     * its run predicts goes on jumping while its group moves far and its flow cannot follow ({@code jumpGoesOn}).
     * The tracker counts a run's travel only once it has {@link #JUMPS_ALIKE} jumps alike, so one chance pairing of
     * two noise clusters or of two movers counts nothing.
     */
    private void jump(double dt, double t) {
        final int nt = tId.length;
        for (int k = 0; k < nt; k++) {
            if (tLive[k] && tGroup[k] >= 0 && tJumps[k] > 0 && jumpGoesOn(k, tGroup[k], dt, t)) {
                tJumped[k] = true;
            }
        }
        final double lost = settings.lostSeconds() + 1e-6;
        while (true) {
            double best = Double.MAX_VALUE;
            int bt = -1;
            int bg = -1;
            for (int k = 0; k < nt; k++) {
                if (!tLive[k] || tGroup[k] >= 0 || Double.isNaN(tSeenAt[k])) {
                    continue;
                }
                final double since = t - tSeenAt[k];
                if (!(since > 0 && since <= lost)) {
                    continue;
                }
                for (int g = 0; g < gr.groups; g++) {
                    if (gTrack[g] >= 0) {
                        continue;
                    }
                    final double d = Math.hypot(gr.sumX[g] / gr.count[g] - tX[k], gr.sumY[g] / gr.count[g] - tY[k]);
                    final double reach = MAX_JUMP_PX_PER_SECOND * since + settings.gatePx()
                            + 0.5 * Math.max(Math.max(tW[k], tH[k]), gr.side(g));
                    if (d > reach || d >= best || !jumpsTo(k, g, since)) {
                        continue;
                    }
                    best = d;
                    bt = k;
                    bg = g;
                }
            }
            if (bt < 0) {
                return;
            }
            tGroup[bt] = bg;
            gTrack[bg] = bt;
            tJumped[bt] = true;
        }
    }

    /**
     * True when track k, jumping, jumps again to group g: it can have jumped there ({@code jumpsTo}), and the
     * group's flow reads less than half the run's speed along it.
     */
    private boolean jumpGoesOn(int k, int g, double dt, double t) {
        final double since = t - tSeenAt[k];
        if (!(since > 0) || !jumpsTo(k, g, since)) {
            return false;
        }
        final double run = t - tJumpT[k];
        final double rvx = (gr.sumX[g] / gr.count[g] - tJumpX[k]) / run;
        final double rvy = (gr.sumY[g] / gr.count[g] - tJumpY[k]) / run;
        final double speed = Math.hypot(rvx, rvy);
        // the flow's reading is px per frame pair of dt seconds
        final double flowAlong = (gr.vu[g] * rvx + gr.vv[g] * rvy) / speed;
        return flowAlong < 0.5 * speed * dt;
    }

    /**
     * True when track k can have jumped to group g in {@code since} seconds: the group has at least
     * {@link #MIN_STEADY_SAMPLES} samples, half to twice the track's peak; the step is at least
     * {@link #FAILED_JUMP_PX} and half the group's larger side (less, and the flow follows it); and a track already
     * jumping goes on its way, within the group angle of its run's direction and, after two jumps, at half to twice
     * its run's speed.
     */
    private boolean jumpsTo(int k, int g, double since) {
        final int n = gr.count[g];
        if (n < MIN_STEADY_SAMPLES || n < 0.5 * tPeak[k] || n > 2.0 * tPeak[k]) {
            return false;
        }
        final double sx = gr.sumX[g] / n - tX[k];
        final double sy = gr.sumY[g] / n - tY[k];
        final double step = Math.hypot(sx, sy);
        if (step < FAILED_JUMP_PX || step < 0.5 * gr.side(g)) {
            return false;
        }
        if (tJumps[k] == 0) {
            return true;
        }
        final double rx = tX[k] - tJumpX[k];
        final double ry = tY[k] - tJumpY[k];
        final double run = Math.hypot(rx, ry);
        final double runSpeed = run / (tSeenAt[k] - tJumpT[k]);
        final double stepSpeed = step / since;
        // one jump's speed scatters (centroids of fragments a fifteenth of a second apart); a longer run's does not
        return run > 0 && rx * sx + ry * sy >= cosGroup * run * step
                && (tJumps[k] < 2 || (stepSpeed >= 0.5 * runSpeed && stepSpeed <= 2.0 * runSpeed));
    }

    /** Pairs groups with tracks, updates them, starts and drops tracks. */
    private void follow(double dt, double t) {
        final int nt = tId.length;
        final double minSpeed = settings.minSpeedPxPerSecond();
        for (int k = 0; k < nt; k++) {
            tGroup[k] = -1;
            tJumped[k] = false;
        }
        Arrays.fill(gTrack, 0, gr.groups, -1);
        while (true) {
            double best = Double.MAX_VALUE;
            int bt = -1;
            int bg = -1;
            for (int k = 0; k < nt; k++) {
                if (!tLive[k] || tGroup[k] >= 0) {
                    continue;
                }
                final double since = t - tSeenAt[k];
                final double ex = tX[k] + tPredVx[k] * since;
                final double ey = tY[k] + tPredVy[k] * since;
                final double gate = settings.gatePx() + 0.5 * Math.max(tW[k], tH[k]);
                final double tSpeed2 = tVx[k] * tVx[k] + tVy[k] * tVy[k];
                for (int g = 0; g < gr.groups; g++) {
                    if (gr.count[g] < MIN_GROUP_SAMPLES || gTrack[g] >= 0) {
                        continue;
                    }
                    final double gvx = gr.vu[g] / dt;
                    final double gvy = gr.vv[g] / dt;
                    final double gSpeed2 = gvx * gvx + gvy * gvy;
                    final double cx = gr.sumX[g] / gr.count[g];
                    final double cy = gr.sumY[g] / gr.count[g];
                    final double d = Math.hypot(cx - ex, cy - ey);
                    if (gvx * tVx[k] + gvy * tVy[k] < 0 && gSpeed2 > minSpeed * minSpeed
                            && tSpeed2 > minSpeed * minSpeed && d > 0.5 * gate) {
                        // both clearly moving, in opposite directions, and not right where predicted: not the
                        // same mover (where predicted it is, since the flow of a fast small mover can fail)
                        continue;
                    }
                    final boolean inside = ex >= (double) gr.minI[g] * stride - stride && ex <= (gr.maxI[g] + 2.0) * stride
                            && ey >= (double) gr.minJ[g] * stride - stride && ey <= (gr.maxJ[g] + 2.0) * stride;
                    if ((d <= gate || inside) && d < best) {
                        best = d;
                        bt = k;
                        bg = g;
                    }
                }
            }
            if (bt < 0) {
                break;
            }
            tGroup[bt] = bg;
            gTrack[bg] = bt;
        }
        jump(dt, t);
        for (int g = 0; g < gr.groups; g++) {
            if (gr.count[g] < MIN_GROUP_SAMPLES || gTrack[g] >= 0) {
                continue;
            }
            int free = -1;
            for (int k = 0; k < nt; k++) {
                if (!tLive[k]) {
                    free = k;
                    break;
                }
            }
            if (free < 0) {
                untracked++;
                continue;
            }
            tLive[free] = true;
            tId[free] = nextId++;
            tBorn[free] = t;
            tSeenAt[free] = Double.NaN;
            tTravel[free] = 0;
            tFlowTravel[free] = 0;
            tEntryX[free] = Double.NaN;
            tCentroidTravel[free] = 0;
            tDistance[free] = 0;
            tMovingSeconds[free] = 0;
            tPeak[free] = 0;
            tJumps[free] = 0;
            tGroup[free] = g;
            gTrack[g] = free;
        }
        final float ax = againstX;
        final float ay = againstY;
        for (int k = 0; k < nt; k++) {
            if (!tLive[k]) {
                continue;
            }
            final int g = tGroup[k];
            if (g < 0) {
                if (t - tSeenAt[k] > settings.lostSeconds() + 1e-6) {
                    tLive[k] = false;
                }
                continue;
            }
            final double vu = gr.vu[g];
            final double vv = gr.vv[g];
            final double m = Math.sqrt(vu * vu + vv * vv);
            final double cx = gr.sumX[g] / gr.count[g];
            final double cy = gr.sumY[g] / gr.count[g];
            final boolean jumping = tJumped[k]; // see jump
            if (jumping && tJumps[k] == 0) {
                tJumpX[k] = tX[k];
                tJumpY[k] = tY[k];
                tJumpT[k] = tSeenAt[k];
            }
            tJumps[k] = jumping ? tJumps[k] + 1 : 0;
            final boolean flowFailed = jumping || flowFailed(k, g, cx, cy, dt, t);
            final boolean inZone = gr.centreInZone(cx, cy);
            if (hasHeading && inZone && jumping) {
                // a run's travel counts once it has enough jumps alike: then all of it from where it began
                final boolean first = tJumps[k] == JUMPS_ALIKE;
                if (tJumps[k] >= JUMPS_ALIKE && (first || !Double.isNaN(tEntryX[k]))) {
                    final double sx = cx - (first ? tJumpX[k] : tEntryX[k]);
                    final double sy = cy - (first ? tJumpY[k] : tEntryY[k]);
                    final double step = Math.sqrt(sx * sx + sy * sy);
                    final double stepAlong = sx * ax + sy * ay;
                    if (step > 0 && (stepAlong >= cosTolerance * step || -stepAlong >= cosTolerance * step)) {
                        tCentroidTravel[k] += stepAlong;
                    }
                }
                tEntryX[k] = cx;
                tEntryY[k] = cy;
                tTravel[k] = Math.max(tFlowTravel[k], tCentroidTravel[k]);
            } else if (hasHeading && inZone) {
                final double along = vu * ax + vv * ay;
                // against adds, with subtracts (a sway back and forth cancels), crossing adds nothing
                if (!flowFailed && m > 0 && (along >= cosTolerance * m || -along >= cosTolerance * m)) {
                    tFlowTravel[k] += along;
                }
                // the centroid's steps, while the group keeps its size and shape: a fast mover whose flow
                // fails (tens of pixels a frame) still shows its travel here; a group that grows, shrinks or
                // changes shape (shake, flicker, a crowd merging) moves its centroid without travelling
                if (!Double.isNaN(tEntryX[k]) && Math.abs(tSeenAt[k] - (t - dt)) < 1e-6 && steady(k, g)
                        && gr.count[g] >= MIN_STEADY_SAMPLES) {
                    final double sx = cx - tEntryX[k];
                    final double sy = cy - tEntryY[k];
                    final double step = Math.sqrt(sx * sx + sy * sy);
                    final double stepAlong = sx * ax + sy * ay;
                    final double floor = settings.minSpeedPxPerSecond() * dt;
                    // and only where the flow, however short, goes the same way at least at the speed floor:
                    // a track hopping between chance clusters of noise moves its centroid, not its flow
                    final boolean flowAgrees = flowFailed || (stepAlong > 0 ? along >= floor : along <= -floor);
                    if (step > 0 && flowAgrees
                            && (stepAlong >= cosTolerance * step || -stepAlong >= cosTolerance * step)) {
                        tCentroidTravel[k] += stepAlong;
                    }
                }
                tEntryX[k] = cx;
                tEntryY[k] = cy;
                tTravel[k] = Math.max(tFlowTravel[k], tCentroidTravel[k]);
            } else {
                // outside: the next step inside starts afresh (a step from an old sighting is no step)
                tEntryX[k] = Double.NaN;
            }
            tDistance[k] += m;
            tMovingSeconds[k] += dt;
            double fvx = vu / dt;
            double fvy = vv / dt;
            if (jumping) {
                // the run's mean velocity: single steps between noisy centroids a fifteenth of a second apart
                // scatter too much to predict with
                final double run = t - tJumpT[k];
                fvx = (cx - tJumpX[k]) / run;
                fvy = (cy - tJumpY[k]) / run;
                tPredVx[k] = fvx;
                tPredVy[k] = fvy;
            } else if (flowFailed) {
                // the track goes on with its centroid's velocity, not the failed reading
                final double since = t - tSeenAt[k];
                fvx = (cx - tX[k]) / since;
                fvy = (cy - tY[k]) / since;
                tPredVx[k] = fvx;
                tPredVy[k] = fvy;
            } else if (!Double.isNaN(tSeenAt[k]) && t > tSeenAt[k]) {
                // predict with the mean of the flow's velocity and the centroid's
                final double since = t - tSeenAt[k];
                tPredVx[k] = 0.5 * (fvx + (cx - tX[k]) / since);
                tPredVy[k] = 0.5 * (fvy + (cy - tY[k]) / since);
            } else {
                tPredVx[k] = fvx;
                tPredVy[k] = fvy;
            }
            tX[k] = cx;
            tY[k] = cy;
            tVx[k] = fvx;
            tVy[k] = fvy;
            tSeenAt[k] = t;
            tSamples[k] = gr.count[g];
            tPeak[k] = Math.max(tPeak[k], gr.count[g]);
            tW[k] = (gr.maxI[g] - gr.minI[g] + 1) * stride;
            tH[k] = (gr.maxJ[g] - gr.minJ[g] + 1) * stride;
        }
    }
}
