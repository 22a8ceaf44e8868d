package wayward.rule;

import java.time.Clock;
import java.util.ArrayDeque;
import java.util.UUID;
import wayward.event.Event;
import wayward.event.EventKind;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;

/**
 * Watches a camera for tampering, from picture statistics and the flow's dominant motion, one analysed frame
 * at a time (analysis thread; buffers sized once per resolution, nothing allocated per frame but the events):
 * <ul>
 * <li>{@code view_blocked}: the spread of 8×8 block means (the picture's large-scale structure) falls under
 *     15 % of its running baseline for 2 s; lights going off scale it by their gain only (0.4 stays above);</li>
 * <li>{@code focus_lost}: the ratio of fine detail (differences of neighbouring 2×2 block means) to the
 *     large-scale spread falls under 70 % of its baseline for 3 s, and so does the fine detail itself; the ratio
 *     does not change with brightness, and the detail keeps a bright blob that only adds large-scale spread
 *     (headlight glare) from reading as blur;</li>
 * <li>{@code picture_frozen}: for 3 s most frame pairs are still (under 0.2 % of the pixels change by more
 *     than 1 grey level; the odd keyframe of a re-encoded still is allowed), on a camera that is normally
 *     never still (its sensor noise survives the encoder). A compressed static scene is as still as a frozen
 *     one, so on such a camera this check stays silent rather than cry wolf;</li>
 * <li>{@code camera_moved}: every 0.5 s the picture is registered on a reference (whole 2×2 blocks, ±12 px,
 *     brightness means removed); a best shift of 3 analysis pixels or more that lasts 1.5 s is a moved camera
 *     (shake stays under it, a knock stays); the reference then follows. The start carries the bearing of the
 *     picture's content shift and its length in analysis pixels.</li>
 * </ul>
 * Baselines are running means over about 30 s, updated only while nothing is wrong, after a 2 s warm-up.
 * Each condition gives a start and, once it is gone for 2 s, an end with the same id.
 */
public final class TamperWatch {
    static final double BLOCKED_SHARE = 0.15;
    static final double BLOCKED_BACK = 0.5;
    static final double FOCUS_SHARE = 0.7;
    static final double FOCUS_BACK = 0.85;
    static final double FROZEN_SECONDS = 3;
    static final double STILL_SHARE = 0.002;
    /** A camera still in at most this share of frame pairs (normally) shows its sensor noise. */
    static final double NEVER_STILL = 0.05;
    /** A lasting shift of this many 2×2 blocks (3 analysis pixels) is a moved camera. */
    static final double MOVED_BLOCKS = 1.5;
    static final int SEARCH_BLOCKS = 6;
    static final double MOVED_HOLD = 1.5;
    static final double BASELINE_SECONDS = 30;
    static final double WARM_UP_SECONDS = 2;
    static final double CLEAR_SECONDS = 2;

    private final String camera;
    private final Clock clock;
    private final ArrayDeque<Event> out = new ArrayDeque<>();
    private byte[] previous;
    private double[] blocks;
    /** Sums of the current frame's 2×2 blocks (4 × their means). */
    private int[] blockSums;
    private int width;
    private int height;
    private double startT = Double.NaN;
    private double lastT = Double.NaN;
    private double baseSpread = Double.NaN;
    private double baseRatio = Double.NaN;
    private double baseDetail = Double.NaN;
    private double stillSince = Double.NaN;
    private double stillness;
    private double baseStill = Double.NaN;
    private double shiftX;
    private double shiftY;
    private double movedSince = Double.NaN;
    /** The 2×2-block picture the moved-camera check registers on. */
    private double[] reference;
    private double lastRegistration = Double.NEGATIVE_INFINITY;
    private final BlockShift shift = new BlockShift();
    private final Condition blocked = new Condition(EventKind.VIEW_BLOCKED, 2);
    private final Condition focus = new Condition(EventKind.FOCUS_LOST, 3);
    private final Condition frozen = new Condition(EventKind.PICTURE_FROZEN, 0);
    private final Condition moved = new Condition(EventKind.CAMERA_MOVED, 0);

    /** One tamper condition: pending → active (start) → gone for CLEAR_SECONDS (end). */
    private final class Condition {
        final EventKind kind;
        final double hold;
        double since = Double.NaN;
        double goneSince = Double.NaN;
        String id;
        double startedAt;

        Condition(EventKind kind, double hold) {
            this.kind = kind;
            this.hold = hold;
        }

        boolean active() {
            return id != null;
        }

        /** Feeds whether the condition holds now (and, for an end, whether it is clearly gone). */
        void update(boolean holds, boolean gone, double t, double bearingDeg, double shiftPx) {
            if (id == null) {
                if (!holds) {
                    since = Double.NaN;
                    return;
                }
                if (Double.isNaN(since)) {
                    since = t;
                }
                if (t - since + 1e-9 >= hold) {
                    id = UUID.randomUUID().toString();
                    startedAt = t;
                    goneSince = Double.NaN;
                    out.add(new Event(id, camera, null, kind, Event.Phase.START, t, clock.instant(), bearingDeg,
                            Double.NaN, Double.NaN, shiftPx, Double.NaN, null, null, null, null));
                }
                return;
            }
            if (!gone) {
                goneSince = Double.NaN;
                return;
            }
            if (Double.isNaN(goneSince)) {
                goneSince = t;
            }
            if (t - goneSince + 1e-9 >= CLEAR_SECONDS) {
                out.add(new Event(id, camera, null, kind, Event.Phase.END, t, clock.instant(), Double.NaN,
                        Double.NaN, Double.NaN, t - startedAt));
                id = null;
                since = Double.NaN;
            }
        }
    }

    public TamperWatch(String camera, Clock clock) {
        this.camera = camera;
        this.clock = clock;
    }

    /** Measures one analysed frame and its flow (the pair ending at it); then drain {@link #poll()}. */
    public void update(GrayFrame f, FlowField field, double t) {
        if (previous == null || width != f.width || height != f.height) {
            width = f.width;
            height = f.height;
            previous = new byte[width * height];
            blocks = new double[(width / 2) * (height / 2)];
            blockSums = new int[blocks.length];
            shift.size(width / 2, height / 2);
            reference = null; // a new size starts a new reference
            System.arraycopy(f.pixels, 0, previous, 0, previous.length);
            startT = t;
            lastT = t;
            baseSpread = Double.NaN;
            baseRatio = Double.NaN;
            return;
        }
        double dt = Math.max(0, t - lastT);
        lastT = t;
        // frozen: hardly a pixel changed since the previous analysed frame (|difference| over 1 grey level);
        // counted in the same pass that sums the 2×2 blocks
        byte[] p = f.pixels;
        int changed = sumBlocks(p);
        System.arraycopy(p, 0, previous, 0, previous.length);
        double changedShare = (double) changed / previous.length;
        boolean still = changedShare < STILL_SHARE;
        // stillness: a running share of still frame pairs over about 1 s, so that the odd keyframe of a
        // re-encoded frozen picture (a few pixels change) does not break the run
        stillness += Math.min(1, dt / 1.0) * ((still ? 1 : 0) - stillness);
        boolean mostlyStill = stillness >= 0.6;
        if (!mostlyStill) {
            stillSince = Double.NaN;
        } else if (Double.isNaN(stillSince)) {
            stillSince = t;
        }
        // only where the picture is normally never still (sensor noise survives the encoder): a compressed
        // static scene is as still as a frozen one, and there a freeze cannot be told from pixels
        boolean noisyCamera = baseStill <= NEVER_STILL;
        double spread = spread();
        double detail = detail();
        double ratio = spread > 1e-6 ? detail / spread : 0;
        lastSpread = spread;
        lastRatio = ratio;
        // camera moved: every 0.5 s, the shift that best registers the 2×2-block picture on the reference
        boolean flat = !Double.isNaN(baseSpread) && spread < 0.5 * baseSpread;
        // the running share takes about 1 s to pass 0.6 after a freeze, so 2 s more make FROZEN_SECONDS
        frozen.update(noisyCamera && mostlyStill && !flat && !blocked.active()
                && t - stillSince + 1e-9 >= FROZEN_SECONDS - 1, stillness < 0.3, t, Double.NaN, Double.NaN);
        if (reference == null) {
            fillBlocks();
            reference = blocks.clone(); // once per size
        } else if (!flat && t - lastRegistration + 1e-9 >= 0.5) {
            lastRegistration = t;
            fillBlocks();
            shift.find(blocks, reference);
            shiftX = shift.x;
            shiftY = shift.y;
            boolean shifted = Math.hypot(shiftX, shiftY) >= MOVED_BLOCKS;
            if (!shifted) {
                movedSince = Double.NaN;
                if (!moved.active()) {
                    System.arraycopy(blocks, 0, reference, 0, blocks.length); // follow slow changes
                }
            } else if (Double.isNaN(movedSince)) {
                movedSince = t;
            }
            boolean wasMoved = moved.active();
            // a block is 2×2 analysis pixels
            moved.update(shifted && t - movedSince + 1e-9 >= MOVED_HOLD, !shifted, t,
                    wayward.zone.ZoneMeter.bearingDeg(-shiftX, -shiftY), 2 * Math.hypot(shiftX, shiftY));
            if (!wasMoved && moved.active()) {
                System.arraycopy(blocks, 0, reference, 0, blocks.length); // the new position is the new reference
                movedSince = Double.NaN;
            }
        }
        if (t - startT < WARM_UP_SECONDS || Double.isNaN(baseSpread)) {
            // warm-up: plain means
            double n = Math.max(1, (t - startT) / Math.max(dt, 1e-3));
            baseSpread = Double.isNaN(baseSpread) ? spread : baseSpread + (spread - baseSpread) / n;
            baseRatio = Double.isNaN(baseRatio) ? ratio : baseRatio + (ratio - baseRatio) / n;
            baseDetail = Double.isNaN(baseDetail) ? detail : baseDetail + (detail - baseDetail) / n;
            baseStill = Double.isNaN(baseStill) ? (still ? 1 : 0) : baseStill + ((still ? 1 : 0) - baseStill) / n;
            return;
        }
        blocked.update(spread < BLOCKED_SHARE * baseSpread, spread > BLOCKED_BACK * baseSpread, t, Double.NaN,
                Double.NaN);
        boolean focusBad = !blocked.active() && spread >= BLOCKED_SHARE * baseSpread && ratio < FOCUS_SHARE * baseRatio
                && detail < FOCUS_SHARE * baseDetail;
        focus.update(focusBad, ratio > FOCUS_BACK * baseRatio, t, Double.NaN, Double.NaN);
        boolean normal = !blocked.active() && !focus.active() && Double.isNaN(blocked.since)
                && Double.isNaN(focus.since) && spread >= 0.5 * baseSpread;
        if (normal) {
            double a = Math.min(1, dt / BASELINE_SECONDS);
            baseSpread += a * (spread - baseSpread);
            baseRatio += a * (ratio - baseRatio);
            baseDetail += a * (detail - baseDetail);
            if (!frozen.active() && !mostlyStill) {
                baseStill += a * ((still ? 1 : 0) - baseStill);
            }
        }
    }

    /**
     * Sums each 2×2 block of the frame into {@link #blockSums} and counts the pixels that differ from the
     * previous frame by more than 1 grey level, in one pass over both pictures (pixels outside whole blocks, an
     * odd last row or column, are counted on their own).
     */
    private int sumBlocks(byte[] p) {
        final int w = width;
        final int bw = w / 2;
        final int bh = height / 2;
        final byte[] q = previous;
        final int[] sums = blockSums;
        int changed = 0;
        for (int by = 0; by < bh; by++) {
            final int row = 2 * by * w;
            for (int bx = 0; bx < bw; bx++) {
                final int k = row + 2 * bx;
                final int a = p[k] & 0xff;
                final int b = p[k + 1] & 0xff;
                final int c = p[k + w] & 0xff;
                final int d = p[k + w + 1] & 0xff;
                sums[by * bw + bx] = a + b + c + d;
                changed += changedBy(a, q[k]) + changedBy(b, q[k + 1]) + changedBy(c, q[k + w])
                        + changedBy(d, q[k + w + 1]);
            }
        }
        if (w % 2 != 0) {
            for (int y = 0; y < 2 * bh; y++) {
                changed += changedBy(p[y * w + w - 1] & 0xff, q[y * w + w - 1]);
            }
        }
        if (height % 2 != 0) {
            for (int i = (height - 1) * w; i < height * w; i++) {
                changed += changedBy(p[i] & 0xff, q[i]);
            }
        }
        return changed;
    }

    /**
     * 1 when grey level v differs from the previous frame's byte by more than 1, else 0; without a branch: in
     * sensor noise it goes either way at random, and a mispredicted branch per pixel cost more than the rest of
     * the watch.
     */
    private static int changedBy(int v, byte previous) {
        final int d = v - (previous & 0xff);
        final int a = (d ^ (d >> 31)) - (d >> 31);
        return (1 - a) >>> 31;
    }

    /** The 2×2 block means from {@link #blockSums}, for the moved-camera check (only when it registers). */
    private void fillBlocks() {
        for (int i = 0; i < blocks.length; i++) {
            blocks[i] = blockSums[i] * 0.25;
        }
    }

    /**
     * Standard deviation of the 8×8 block means, from the 2×2 block sums. Integer sums: each mean is the same
     * number as summed from the block means in floating point (quarters of integers add up exactly).
     */
    private double spread() {
        final int bw = width / 2;
        final int bh = height / 2;
        final int[] sums = blockSums;
        double sum = 0;
        double sum2 = 0;
        int n = 0;
        for (int y = 0; y + 4 <= bh; y += 4) {
            for (int x = 0; x + 4 <= bw; x += 4) {
                int s16 = 0;
                for (int j = 0; j < 4; j++) {
                    final int row = (y + j) * bw + x;
                    s16 += sums[row] + sums[row + 1] + sums[row + 2] + sums[row + 3];
                }
                final double m = s16 / 64.0;
                sum += m;
                sum2 += m * m;
                n++;
            }
        }
        if (n == 0) {
            return 0;
        }
        double mean = sum / n;
        return Math.sqrt(Math.max(0, sum2 / n - mean * mean));
    }

    /**
     * Mean absolute difference of neighbouring 2×2 block means (fine detail, with the noise halved), summed as
     * integers over the block sums: the same number as the floating-point sum over the means.
     */
    private double detail() {
        final int bw = width / 2;
        final int bh = height / 2;
        final int[] sums = blockSums;
        long total = 0;
        for (int y = 0; y + 1 < bh; y++) {
            final int row = y * bw;
            for (int x = 0; x + 1 < bw; x++) {
                final int c = sums[row + x];
                total += Math.abs(sums[row + x + 1] - c) + Math.abs(sums[row + bw + x] - c);
            }
        }
        final int n = 2 * (bh - 1) * (bw - 1);
        return n <= 0 ? 0 : total * 0.25 / n;
    }

    private double lastSpread;
    private double lastRatio;

    /** For tests and tuning: the latest figures and their baselines. */
    record Figures(double spread, double baseSpread, double ratio, double baseRatio, double shift, double baseStill,
            double stillness) {
    }

    Figures figures() {
        return new Figures(lastSpread, baseSpread, lastRatio, baseRatio, Math.hypot(shiftX, shiftY), baseStill,
                stillness);
    }

    /** The next event this watch raised, or null. */
    public Event poll() {
        return out.poll();
    }

    /** Ends what is active at the end of the stream (replay). */
    public void finish(double t) {
        for (Condition c : new Condition[] {blocked, focus, frozen, moved}) {
            if (c.active()) {
                out.add(new Event(c.id, camera, null, c.kind, Event.Phase.END, t, clock.instant(), Double.NaN,
                        Double.NaN, Double.NaN, t - c.startedAt));
                c.id = null;
            }
        }
    }
}
