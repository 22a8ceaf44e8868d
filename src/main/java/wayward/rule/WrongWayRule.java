package wayward.rule;

import java.time.Clock;
import java.util.UUID;
import wayward.event.Event;
import wayward.event.EventKind;
import wayward.zone.Movers;
import wayward.zone.ZoneMeter;

/**
 * Decides {@code wrong_way} events on movers, not on shares of the zone: an event starts when <em>one</em>
 * mover of at least {@link MoverRuleSettings#minMoverAreaPx} has travelled against the heading at least
 * {@link MoverRuleSettings#minTravelPx} and has been followed at least {@link MoverRuleSettings#holdSeconds}, or
 * has travelled {@link MoverRuleSettings#quickTravelPx} whatever its age. A small mover in a large zone decides
 * exactly as in a small zone: the zone's size enters nowhere.
 *
 * <pre>
 * idle ──a mover qualifies──▶ active (start) ──no member seen for clear s──▶ idle (end)
 * </pre>
 *
 * <p><b>Members.</b> The mover that started the event is its first member. Another qualifying mover joins the
 * open event when it rides with a member: at a like velocity, its box touching the member's box at the member's
 * predicted position (apart by at most {@link #JOIN_GAP_PX}); or, when one of the two is a rim (a box thin along
 * its motion: the front or back edge of a plain body, whose inside carries no trusted sample), near it. Two
 * vehicles nose to tail, each seen whole, have still ground between them, a gap wider than a couple of grid
 * points. A qualifying mover that does not ride with a member is a different one: it ends the open event at
 * once and starts its own with the next frame, so two wrong-way movers in a row are two events even when the
 * second enters before the first has left, and events of one zone never overlap. Otherwise the event ends when
 * no member has been seen for {@link MoverRuleSettings#clearSeconds}.
 *
 * <p><b>Rest.</b> A mover that was a member of an ended event never starts or ends another. After an end, for
 * {@link MoverRuleSettings#restSeconds}, neither can a new track that began where the last member was lost (its first point within
 * the same distance of the member's predicted path): that is the same mover picked up again after a gap. Any
 * other mover may start an event at once; rest does not hold back a second wrong-way mover.
 *
 * <p>One instance per zone, called by the camera's analysis thread in stream-time order; no locks. Allocates
 * only when it emits an event.
 */
public final class WrongWayRule {
    /** Slack on time comparisons, seconds: stream times are sums of frame intervals and carry rounding. */
    private static final double EPSILON_SECONDS = 1e-6;
    /** Nearest a new track continues a lost member after an end, analysis pixels (also: 2 × its size). */
    static final double JOIN_PX = 48;
    /**
     * Widest gap, analysis pixels, between a mover's box and a member's predicted box for the two to be one body:
     * three grid points at the default stride of 4 (samples of one body separated by at most two unsampled points:
     * a glare patch ahead of a vehicle, a piece of a textured load read apart from the rest).
     */
    static final double JOIN_GAP_PX = 12;
    /**
     * A mover with at most 1/this of a member's peak samples, at the member's side, is a fragment of it (a glare
     * patch, a corner read apart) whatever its velocity, which a handful of samples measures poorly.
     */
    static final int FRAGMENT_SHARE = 4;
    /** Points of the mover's path in an event. */
    static final int PATH_POINTS = 8;
    private static final int MAX_MEMBERS = 64;

    private final String camera;
    private final String zone;
    private final MoverRuleSettings settings;
    private final Clock clock;

    private boolean active;
    private String eventId;
    private double startedAt;
    private double lastSeen;
    private double peakShare;
    // members of the open event, with where and how each was last seen
    private final long[] memberId = new long[MAX_MEMBERS];
    private final double[] memberSeen = new double[MAX_MEMBERS];
    private final double[] memberX = new double[MAX_MEMBERS];
    private final double[] memberY = new double[MAX_MEMBERS];
    private final double[] memberVx = new double[MAX_MEMBERS];
    private final double[] memberVy = new double[MAX_MEMBERS];
    private final double[] memberW = new double[MAX_MEMBERS];
    private final double[] memberH = new double[MAX_MEMBERS];
    private final int[] memberSamples = new int[MAX_MEMBERS];
    private int members;
    // the mover that started the event, as last seen (for the end record)
    private long triggerId;
    private int triggerW;
    private int triggerH;
    private int triggerSamples;
    private double triggerSpeed;
    private double triggerTravel;
    private double triggerVx;
    private double triggerVy;
    private final double[] triggerPath = new double[2 * PATH_POINTS];
    private int triggerPoints;
    // after an end: the ended event's members and its last member's motion
    /** Tracks that were members of an ended event (a ring of the latest): they never start or end another. */
    private final long[] retiredId = new long[4 * MAX_MEMBERS];
    private int retiredNext;
    private double restUntil = Double.NEGATIVE_INFINITY;
    private double endSeen;
    private double endX;
    private double endY;
    private double endVx;
    private double endVy;
    private double endSize;

    public WrongWayRule(String camera, String zone, MoverRuleSettings settings, Clock clock) {
        this.camera = camera;
        this.zone = zone;
        this.settings = settings;
        this.clock = clock;
    }

    public MoverRuleSettings settings() {
        return settings;
    }

    /** True while an event is open. */
    public boolean active() {
        return active;
    }

    /** Current state as a word for status pages and reports: idle or active. */
    public String stateName() {
        return active ? "active" : "idle";
    }

    /**
     * Feeds one frame's movers; frames must come in increasing stream time.
     *
     * @param againstShare the zone's share of samples moving against the heading in this frame (reported as the
     *                     event's coverage; it decides nothing)
     * @return the event phase this frame decided, or null
     */
    public Event update(Movers m, double againstShare) {
        final double t = m.streamSeconds;
        if (active) {
            peakShare = Math.max(peakShare, againstShare);
            for (int k = 0; k < m.capacity(); k++) {
                if (!m.live(k) || !m.seen(k)) {
                    continue;
                }
                int j = member(m.id(k));
                if (j < 0 && qualifies(m, k) && !retired(m.id(k))) {
                    if (!ridesWithMember(m, k, t) || members == MAX_MEMBERS) {
                        // a different wrong-way mover: this event ends, its own starts with the next frame
                        return end(t);
                    }
                    j = members++;
                    memberId[j] = m.id(k);
                }
                if (j >= 0) {
                    remember(j, m, k, t);
                    lastSeen = t;
                    if (m.id(k) == triggerId) {
                        keepTrigger(m, k);
                    }
                }
            }
            if (t - lastSeen + EPSILON_SECONDS >= settings.clearSeconds()) {
                return end(t);
            }
            return null;
        }
        int best = -1;
        for (int k = 0; k < m.capacity(); k++) {
            if (!m.live(k) || !m.seen(k) || !qualifies(m, k) || restingMover(m, k, t)) {
                continue;
            }
            if (best < 0 || m.travelPx(k) > m.travelPx(best)) {
                best = k;
            }
        }
        return best < 0 ? null : start(m, best, t, againstShare);
    }

    /** Ends an open event at the end of the stream (replay); returns the end phase or null. */
    public Event finish(double streamSeconds) {
        return active ? end(streamSeconds) : null;
    }

    private boolean qualifies(Movers m, int k) {
        if (m.peakAreaPx(k) + 1e-9 < settings.minMoverAreaPx()) {
            return false;
        }
        double travel = m.travelPx(k) + 1e-6;
        return travel >= settings.quickTravelPx()
                || (travel >= settings.minTravelPx() && m.ageSeconds(k) + EPSILON_SECONDS >= settings.holdSeconds());
    }

    private boolean retired(long id) {
        for (long r : retiredId) {
            if (r == id && id != 0) {
                return true;
            }
        }
        return false;
    }

    private int member(long id) {
        for (int j = 0; j < members; j++) {
            if (memberId[j] == id) {
                return j;
            }
        }
        return -1;
    }

    private void remember(int j, Movers m, int k, double t) {
        memberSeen[j] = t;
        memberX[j] = m.x(k);
        memberY[j] = m.y(k);
        memberVx[j] = m.vx(k);
        memberVy[j] = m.vy(k);
        memberW[j] = m.widthPx(k);
        memberH[j] = m.heightPx(k);
        memberSamples[j] = m.peakSamples(k);
    }

    /**
     * One body with a member: at a like velocity, and either its box touches the member's box at the member's
     * predicted position (apart by at most {@link #JOIN_GAP_PX}), or one of the two is a rim (thin along its
     * motion: the front or back edge of a plain body whose length the flow cannot see) and they lie within
     * max({@link #JOIN_PX}, twice the larger's size) of each other.
     */
    private boolean ridesWithMember(Movers m, int k, double t) {
        for (int j = 0; j < members; j++) {
            if (t - memberSeen[j] > settings.clearSeconds() + EPSILON_SECONDS) {
                continue;
            }
            double dt = t - memberSeen[j];
            double dx = m.x(k) - (memberX[j] + memberVx[j] * dt);
            double dy = m.y(k) - (memberY[j] + memberVy[j] * dt);
            double gap = Math.max(Math.abs(dx) - (m.widthPx(k) + memberW[j]) / 2,
                    Math.abs(dy) - (m.heightPx(k) + memberH[j]) / 2);
            if (gap <= JOIN_GAP_PX && m.peakSamples(k) * FRAGMENT_SHARE <= memberSamples[j]) {
                return true; // a fragment at the member's side: too few samples for its velocity to mean much
            }
            double dv = Math.hypot(m.vx(k) - memberVx[j], m.vy(k) - memberVy[j]);
            double speed = Math.hypot(memberVx[j], memberVy[j]);
            if (dv > 0.5 * speed + 5) {
                continue;
            }
            if (gap <= JOIN_GAP_PX) {
                return true;
            }
            if (rim(m.widthPx(k), m.heightPx(k), m.vx(k), m.vy(k)) || rim(memberW[j], memberH[j], memberVx[j], memberVy[j])) {
                double size = Math.max(Math.max(m.widthPx(k), m.heightPx(k)), Math.max(memberW[j], memberH[j]));
                if (Math.hypot(dx, dy) <= Math.max(JOIN_PX, 2 * size)) {
                    return true;
                }
            }
        }
        return false;
    }

    /** A box at most half as long along its motion as across it: the moving edge of something longer. */
    static boolean rim(double w, double h, double vx, double vy) {
        double speed = Math.hypot(vx, vy);
        if (speed <= 0) {
            return false;
        }
        double ux = Math.abs(vx) / speed;
        double uy = Math.abs(vy) / speed;
        return ux * w + uy * h <= 0.5 * (uy * w + ux * h);
    }

    /** During rest: a member of the ended event, or a track that began where its last member was lost. */
    private boolean restingMover(Movers m, int k, double t) {
        if (retired(m.id(k))) {
            return true;
        }
        if (t + EPSILON_SECONDS >= restUntil) {
            return false;
        }
        if (m.pathCount(k) == 0) {
            return false;
        }
        double born = t - m.ageSeconds(k);
        double dt = born - endSeen;
        if (dt < -EPSILON_SECONDS) {
            return false; // followed while the ended event's last member was still seen: another mover
        }
        double d = Math.hypot(m.pathX(k, 0) - (endX + endVx * dt), m.pathY(k, 0) - (endY + endVy * dt));
        return d <= Math.max(JOIN_PX, 2 * endSize);
    }

    private void keepTrigger(Movers m, int k) {
        triggerW = m.widthPx(k);
        triggerH = m.heightPx(k);
        triggerSamples = m.peakSamples(k);
        triggerSpeed = m.speed(k);
        triggerTravel = m.travelPx(k);
        triggerVx = m.vx(k);
        triggerVy = m.vy(k);
        triggerPoints = m.pathFractions(k, PATH_POINTS, triggerPath);
    }

    private Event start(Movers m, int k, double t, double againstShare) {
        active = true;
        eventId = UUID.randomUUID().toString();
        startedAt = t;
        lastSeen = t;
        peakShare = againstShare;
        members = 1;
        memberId[0] = m.id(k);
        remember(0, m, k, t);
        triggerId = m.id(k);
        keepTrigger(m, k);
        return new Event(eventId, camera, zone, EventKind.WRONG_WAY, Event.Phase.START, t, clock.instant(),
                ZoneMeter.bearingDeg(triggerVx, triggerVy), triggerSpeed, againstShare, Double.NaN, null, null,
                mover());
    }

    private Event end(double t) {
        active = false;
        restUntil = t + settings.restSeconds();
        for (int j = 0; j < members; j++) {
            retiredId[retiredNext] = memberId[j];
            retiredNext = (retiredNext + 1) % retiredId.length;
        }
        int last = 0;
        for (int j = 1; j < members; j++) {
            if (memberSeen[j] > memberSeen[last]) {
                last = j;
            }
        }
        endSeen = memberSeen[last];
        endX = memberX[last];
        endY = memberY[last];
        endVx = memberVx[last];
        endVy = memberVy[last];
        endSize = Math.max(memberW[last], memberH[last]);
        return new Event(eventId, camera, zone, EventKind.WRONG_WAY, Event.Phase.END, t, clock.instant(),
                ZoneMeter.bearingDeg(triggerVx, triggerVy), triggerSpeed, peakShare, t - startedAt, null, null,
                mover());
    }

    private Event.Mover mover() {
        return new Event.Mover(triggerW, triggerH, triggerSamples,
                java.util.Arrays.copyOf(triggerPath, 2 * triggerPoints), triggerSpeed, triggerTravel);
    }
}
