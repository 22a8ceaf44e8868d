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
 * (with-heading motion subtracts, crossing adds nothing; a frame's reading counts up to the group's own extent,
 * see {@code believed}). That sum comes from the flow inside the group, not
 * from the centroid, so a mover that shrinks as it drives away, or whose outline changes, still adds up its
 * true travel. Where the flow fails (a small mover jumping tens of pixels a frame), the centroid's steps count
 * instead, but only while the group keeps its size and shape, has at least {@link #MIN_STEADY_SAMPLES} samples
 * and its flow goes the same way at the speed floor, each step at most {@link #STEP_PER_FLOW} times that flow
 * plus a grid step; the travel is the larger of the two sums.
 *
 * <p><b>Following.</b> Each track predicts its centroid (last centroid + velocity × time since seen); groups
 * and tracks are paired nearest first within a gate (gate + half the track's size, or the prediction inside the
 * group's box), never when both move clearly and in opposite directions; a speck of a body does not take the
 * body's whole group while the body's track can ({@link #SPECK_GROWTH}). An unpaired group of at least two
 * samples starts a track; a track that finds no group for {@link MoverSettings#lostSeconds} is dropped. A track
 * whose flow reading fails on a jump it predicted ({@link #FAILED_JUMP_PX} or more) while its group turns up
 * where it should goes on with its centroid's velocity and step (see {@code flowFailed}); a group that turns up
 * far from every prediction may be a small mover that jumped beyond the flow's reach ({@link Jumps}). Which
 * samples move and how they group: {@link MoverGroups}.
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
    /** Tracks followed at once at most; at least 4, otherwise a quarter of the zone's samples. */
    static final int MAX_TRACKS = 64;
    /** How far ahead of a track's centroid still ground is looked for, analysis pixels. */
    static final double LOOK_AHEAD_PX = 160;
    /**
     * A centroid step counts as travel up to this many times the group's own flow along the heading, plus one grid
     * step ({@code stride}) for the centroid's jitter, where the flow did not fail. The flow reads a plain body's
     * outline short, a small one's down to a sixth of its motion (probe p13: 9–25 px/s read for 54, steps of about
     * 5 px, which the grid step covers), while a chance cluster of rain streaks whose centroid jumps 26 px on a flow
     * of 1.4 px is no body moving. Chosen on the tune half: 4 changes no scene there, 3 starts its crawl s36 0.2 s
     * later.
     */
    static final double STEP_PER_FLOW = 4;

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

    private final MoverGroups gr;
    private final int[] gTrack;
    private final Tracks tr;
    private final Jumps jumps;
    /** Small movers hopping beyond the flow's reach, found in the picture; null: no heading. */
    private final Hops hops;
    private final Nearest near = new Nearest();
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
        gr = new MoverGroups(mask, layout, settings, removeCameraMotion);
        int n = gridWidth * gridHeight;
        gTrack = new int[n];
        int t = capacity(gr.zoneSamples());
        tr = new Tracks(t);
        jumps = new Jumps(gr, tr, gTrack, settings);
        hops = hasHeading ? new Hops(mask, imageWidth, imageHeight, stride, againstX, againstY) : null;
    }

    /** Tracks followed at once at most for a zone of {@code samples} samples. */
    static int capacity(int samples) {
        return Math.max(4, Math.min(MAX_TRACKS, samples / 4));
    }

    /** A table the size of this tracker's track capacity, for {@link #update}. */
    public Movers newMovers() {
        return new Movers(tr.capacity() + Hops.OUT);
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
        Arrays.fill(tr.live, false);
        gr.reset();
        if (hops != null) {
            hops.reset();
        }
    }

    /**
     * Finds this frame's groups, follows the tracks and writes them into {@code out}.
     *
     * @param flow         a field of the layout given at construction
     * @param frameSeconds stream seconds between the flow's two frames (more than 0)
     * @param out          a table from {@link #newMovers}; refilled
     */
    public void update(FlowField flow, double frameSeconds, double streamSeconds, Movers out) {
        update(flow, null, false, frameSeconds, streamSeconds, out);
    }

    /**
     * As {@link #update(FlowField, double, double, Movers)}, and also follows small movers hopping beyond the
     * flow's reach in the picture ({@link Hops}).
     *
     * @param pixels the later frame of the flow, grey, the flow's picture size; null: flow only
     * @param still  the still-frame gate found nothing changed around the zone in it (the hops skip their
     *               differences)
     */
    public void update(FlowField flow, byte[] pixels, boolean still, double frameSeconds, double streamSeconds,
            Movers out) {
        if (flow.width != gridWidth || flow.height != gridHeight || flow.stride != stride) {
            throw new IllegalArgumentException("flow: " + flow.width + "x" + flow.height + " every " + flow.stride
                    + " px (expected " + gridWidth + "x" + gridHeight + " every " + stride + " px)");
        }
        if (!(frameSeconds > 0)) {
            throw new IllegalArgumentException("frameSeconds: " + frameSeconds + " (expected more than 0)");
        }
        if (out.capacity() != tr.capacity() + Hops.OUT) {
            throw new IllegalArgumentException("out: capacity " + out.capacity() + " (expected "
                    + (tr.capacity() + Hops.OUT) + ")");
        }
        gr.find(flow, frameSeconds);
        if (hops != null && pixels != null) {
            hops.update(pixels, streamSeconds, still);
        }
        follow(frameSeconds, streamSeconds);
        out.begin(streamSeconds, imageWidth, imageHeight, stride);
        for (int t = 0; t < tr.capacity(); t++) {
            if (!tr.live[t]) {
                continue;
            }
            boolean seen = tr.seenAt[t] == streamSeconds;
            double speed = tr.movingSeconds[t] > 0 ? tr.distance[t] / tr.movingSeconds[t] : 0;
            int slot = out.put(tr.id[t], seen, streamSeconds - tr.born[t], tr.travel[t], seen ? tr.samples[t] : 0, tr.peak[t],
                    tr.w[t], tr.h[t], tr.x[t], tr.y[t], tr.vx[t], tr.vy[t], speed);
            if (seen && slot >= 0) {
                out.stillAheadPx(slot, stillAhead(t));
            }
        }
        if (hops != null && pixels != null) {
            hops.write(out);
        }
        out.end();
    }

    /**
     * Distance from track t's centroid, along its velocity, to the first still textured sample, analysis pixels
     * (half-stride steps, nearest sample); infinity when the look-ahead reaches the picture's edge or
     * {@link #LOOK_AHEAD_PX} first, or the track does not move.
     */
    private double stillAhead(int t) {
        final double speed = Math.hypot(tr.vx[t], tr.vy[t]);
        if (!(speed > 0)) {
            return Double.POSITIVE_INFINITY;
        }
        final double ux = tr.vx[t] / speed;
        final double uy = tr.vy[t] / speed;
        final double step = 0.5 * stride;
        for (double d = step; d <= LOOK_AHEAD_PX; d += step) {
            final int k = gr.sampleAt(tr.x[t] + ux * d, tr.y[t] + uy * d);
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
        return n >= 0.6 * tr.samples[k] && n <= 1.6 * tr.samples[k]
                && Math.abs(w - tr.w[k]) <= Math.max(8, 0.5 * tr.w[k]) && Math.abs(h - tr.h[k]) <= Math.max(8, 0.5 * tr.h[k]);
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
        if (Double.isNaN(tr.seenAt[k]) || Math.abs(tr.seenAt[k] - (t - dt)) > 1e-6 || gr.count[g] < MIN_STEADY_SAMPLES) {
            return false;
        }
        final double tvx = tr.vx[k];
        final double tvy = tr.vy[k];
        final double speed = Math.sqrt(tvx * tvx + tvy * tvy);
        final double predicted = speed * dt;
        if (!(predicted >= FAILED_JUMP_PX)) {
            return false;
        }
        final double flowAlong = (gr.vu[g] * tvx + gr.vv[g] * tvy) / (dt * speed);
        final double stepAlong = ((cx - tr.x[k]) * tvx + (cy - tr.y[k]) * tvy) / speed;
        return flowAlong < 0.5 * speed && stepAlong >= 0.25 * predicted && stepAlong <= 1.5 * predicted + stride;
    }

    /**
     * A group more than this many times a speck track's largest goes to the speck only when no other track takes
     * it, where the speck lies inside a body's predicted box ({@link #pieceOf}). The same share as a fragment's in
     * the wrong-way rule. Found on real footage (Debian's tree.avi, about two new frames a second): a 2-sample
     * track at a hand's edge, nearer to the hand's whole group than the hand's own track's prediction, took the
     * group, and a 2 → 166 sample step counts no centroid travel, so the hand never travelled far enough. With
     * the first pass, on the suite's sets (same flow, `MoverTuning` replays): no new false alert in any set; tune
     * s19 and s66 start 0.14 and 0.07 s sooner; weather w08 (a crawl from the side whose track broke) 4.43 → 1.30 s
     * over the hold and w04 (a crawl in rain) caught at last (12.3 s); held-out s20 0.2 s sooner, s21 0.14 s later.
     * Pairing every track by distance over its gate instead raised false alerts in blizzard, crawl and snow
     * scenes; refusing a speck any group 4 × its size, body or not, raised two in the weather set.
     */
    static final int SPECK_GROWTH = 4;

    /**
     * Whether a speck track k (never {@link #MIN_STEADY_SAMPLES} samples), predicted at (ex, ey), lies inside the
     * predicted box of another track that has been a body: then it is a piece of that body read apart (an edge, a
     * finger), and the body's whole group belongs to the body's track, not to the speck that happens to be nearer.
     */
    private boolean pieceOf(int k, double ex, double ey, double t) {
        for (int b = 0; b < tr.capacity(); b++) {
            if (b == k || !tr.live[b] || tr.peak[b] < SPECK_GROWTH * Math.max(1, tr.peak[k])) {
                continue;
            }
            final double bx = predictedX(b, t);
            final double by = predictedY(b, t);
            if (Math.abs(ex - bx) <= 0.5 * tr.w[b] && Math.abs(ey - by) <= 0.5 * tr.h[b]) {
                return true;
            }
        }
        return false;
    }

    /** Where track k's centroid is predicted at time t: its last centroid moved on by its predicting velocity. */
    private double predictedX(int k, double t) {
        return tr.x[k] + tr.predVx[k] * (t - tr.seenAt[k]);
    }

    private double predictedY(int k, double t) {
        return tr.y[k] + tr.predVy[k] * (t - tr.seenAt[k]);
    }

    /** Pairs groups with tracks, updates them, starts and drops tracks. */
    private void follow(double dt, double t) {
        final int nt = tr.capacity();
        final double minSpeed = settings.minSpeedPxPerSecond();
        for (int k = 0; k < nt; k++) {
            tr.group[k] = -1;
            tr.jumped[k] = false;
        }
        Arrays.fill(gTrack, 0, gr.groups, -1);
        // first without pairs of a speck of a body with a group the body's own track can take (see pieceOf)
        boolean bodiesFirst = true;
        while (true) {
            near.clear();
            for (int k = 0; k < nt; k++) {
                if (!tr.live[k] || tr.group[k] >= 0) {
                    continue;
                }
                final double ex = predictedX(k, t);
                final double ey = predictedY(k, t);
                final double gate = settings.gatePx() + 0.5 * Math.max(tr.w[k], tr.h[k]);
                final double tSpeed2 = tr.vx[k] * tr.vx[k] + tr.vy[k] * tr.vy[k];
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
                    if (gvx * tr.vx[k] + gvy * tr.vy[k] < 0 && gSpeed2 > minSpeed * minSpeed
                            && tSpeed2 > minSpeed * minSpeed && d > 0.5 * gate) {
                        // both clearly moving, in opposite directions, and not right where predicted: not the
                        // same mover (where predicted it is, since the flow of a fast small mover can fail)
                        continue;
                    }
                    final boolean inside = ex >= (double) gr.minI[g] * stride - stride && ex <= (gr.maxI[g] + 2.0) * stride
                            && ey >= (double) gr.minJ[g] * stride - stride && ey <= (gr.maxJ[g] + 2.0) * stride;
                    if ((d <= gate || inside) && !(bodiesFirst && tr.peak[k] < MIN_STEADY_SAMPLES
                            && gr.count[g] > SPECK_GROWTH * tr.peak[k] && pieceOf(k, ex, ey, t))) {
                        near.offer(d, k, g);
                    }
                }
            }
            if (near.track < 0) {
                if (bodiesFirst) {
                    bodiesFirst = false;
                    continue;
                }
                break;
            }
            tr.group[near.track] = near.group;
            gTrack[near.group] = near.track;
        }
        jumps.pair(dt, t);
        for (int g = 0; g < gr.groups; g++) {
            if (gr.count[g] < MIN_GROUP_SAMPLES || gTrack[g] >= 0) {
                continue;
            }
            final int free = tr.start(g, t);
            if (free < 0) {
                untracked++;
                continue;
            }
            gTrack[g] = free;
        }
        for (int k = 0; k < nt; k++) {
            if (!tr.live[k]) {
                continue;
            }
            final int g = tr.group[k];
            if (g < 0) {
                if (t - tr.seenAt[k] > settings.lostSeconds() + 1e-6) {
                    tr.live[k] = false;
                }
                continue;
            }
            final double vu = gr.vu[g];
            final double vv = gr.vv[g];
            final double m = Math.sqrt(vu * vu + vv * vv);
            final double cx = gr.sumX[g] / gr.count[g];
            final double cy = gr.sumY[g] / gr.count[g];
            final boolean jumping = tr.jumped[k]; // see Jumps
            final boolean flowFailed = jumping || flowFailed(k, g, cx, cy, dt, t);
            final boolean inZone = gr.centreInZone(cx, cy);
            if (hasHeading && inZone && jumping) {
                // a run of jumps is followed (the track goes on) but adds no travel: groups of chance clusters of
                // noise pair as well as a small mover's do; a small mover that hops is followed in the picture
                // instead (Hops), where its footprint is its own
                tr.entryX[k] = cx;
                tr.entryY[k] = cy;
            } else if (hasHeading && inZone) {
                final double along = vu * againstX + vv * againstY;
                // against adds, with subtracts (a sway back and forth cancels), crossing adds nothing
                if (!flowFailed) {
                    // a group's flow is believed as far as the group's own extent in one frame (see believed)
                    tr.flowTravel[k] += believed(g, m) * headed(vu, vv);
                }
                // the centroid's steps, while the group keeps its size and shape: a fast mover whose flow
                // fails (tens of pixels a frame) still shows its travel here; a group that grows, shrinks or
                // changes shape (shake, flicker, a crowd merging) moves its centroid without travelling
                if (!Double.isNaN(tr.entryX[k]) && Math.abs(tr.seenAt[k] - (t - dt)) < 1e-6 && steady(k, g)
                        && gr.count[g] >= MIN_STEADY_SAMPLES) {
                    final double stepAlong = headed(cx - tr.entryX[k], cy - tr.entryY[k]);
                    final double floor = settings.minSpeedPxPerSecond() * dt;
                    // and only where the flow, however short, goes the same way at least at the speed floor:
                    // a track hopping between chance clusters of noise moves its centroid, not its flow
                    if (flowFailed) {
                        tr.centroidTravel[k] += stepAlong;
                    } else if (stepAlong > 0 ? along >= floor : along <= -floor) {
                        final double most = STEP_PER_FLOW * Math.abs(along) + stride;
                        tr.centroidTravel[k] += Math.max(-most, Math.min(most, stepAlong));
                    }
                }
                tr.entryX[k] = cx;
                tr.entryY[k] = cy;
                tr.travel[k] = Math.max(tr.flowTravel[k], tr.centroidTravel[k]);
            } else {
                // outside: the next step inside starts afresh (a step from an old sighting is no step)
                tr.entryX[k] = Double.NaN;
            }
            tr.distance[k] += m;
            tr.movingSeconds[k] += dt;
            double fvx = vu / dt;
            double fvy = vv / dt;
            if (jumping) {
                // the run's mean velocity: single steps between noisy centroids a fifteenth of a second apart
                // scatter too much to predict with
                final double run = t - dt - tr.jumpT[k];
                fvx = (cx - tr.jumpX[k]) / run;
                fvy = (cy - tr.jumpY[k]) / run;
                tr.predVx[k] = fvx;
                tr.predVy[k] = fvy;
            } else if (flowFailed) {
                // the track goes on with its centroid's velocity, not the failed reading
                final double since = t - tr.seenAt[k];
                fvx = (cx - tr.x[k]) / since;
                fvy = (cy - tr.y[k]) / since;
                tr.predVx[k] = fvx;
                tr.predVy[k] = fvy;
            } else if (!Double.isNaN(tr.seenAt[k]) && t > tr.seenAt[k]) {
                // predict with the mean of the flow's velocity and the centroid's
                final double since = t - tr.seenAt[k];
                tr.predVx[k] = 0.5 * (fvx + (cx - tr.x[k]) / since);
                tr.predVy[k] = 0.5 * (fvy + (cy - tr.y[k]) / since);
            } else {
                tr.predVx[k] = fvx;
                tr.predVy[k] = fvy;
            }
            tr.x[k] = cx;
            tr.y[k] = cy;
            tr.vx[k] = fvx;
            tr.vy[k] = fvy;
            tr.seenAt[k] = t;
            tr.placedAt[k] = t - dt;
            tr.samples[k] = gr.count[g];
            tr.peak[k] = Math.max(tr.peak[k], gr.count[g]);
            tr.w[k] = (gr.maxI[g] - gr.minI[g] + 1) * stride;
            tr.h[k] = (gr.maxJ[g] - gr.minJ[g] + 1) * stride;
        }
    }

    /**
     * The share of group g's flow reading (length m, pixels between the two frames) that counts as travel: all of it
     * up to the group's own extent (its box's longer side), that extent beyond. The pyramid cannot follow a mover
     * farther than about its own size between two frames (a coarse level blurs it into the ground; the
     * object-motion benchmark's small objects lose most of their catch at 6–8 px), so a small group that reads more
     * is reading noise, flicker or a neighbour's motion: in tune s42 (mains flicker), with a flow a tenth of a pixel
     * less converged, a 2-sample group 8 × 12 px read 20 px in one frame and carried a 7-sample track from 2 px of
     * travel to 22 px and a false alert. A mover that does jump farther than its size is followed by its centroid
     * or its hops ({@link #flowFailed}, {@link Jumps}, {@link Hops}), not by this sum. Large groups are not
     * affected; chosen for the reason above, checked on the tune half (same events with today's flow, fewer false
     * alerts under perturbed flows: DEVELOPERS.md, "Movers", stop 41).
     */
    private double believed(int g, double m) {
        final double extent = Math.max(gr.maxI[g] - gr.minI[g] + 1, gr.maxJ[g] - gr.minJ[g] + 1) * (double) stride;
        return m > extent ? extent / m : 1;
    }

    /**
     * The part of the step (sx, sy) along the against direction when the step goes with or against the heading
     * within the tolerance; 0 when it crosses (or is no step).
     */
    private double headed(double sx, double sy) {
        final double step = Math.sqrt(sx * sx + sy * sy);
        final double along = sx * againstX + sy * againstY;
        return step > 0 && (along >= cosTolerance * step || -along >= cosTolerance * step) ? along : 0;
    }
}
