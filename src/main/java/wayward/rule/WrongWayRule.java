package wayward.rule;

import java.time.Clock;
import java.util.UUID;
import wayward.event.Event;
import wayward.event.EventKind;
import wayward.zone.MoverSettings;
import wayward.zone.Movers;
import wayward.zone.ZoneMeter;

/**
 * Decides {@code wrong_way} events on movers, not on shares of the zone: an event starts when <em>one</em>
 * mover of at least {@link MoverRuleSettings#minMoverAreaPx} has travelled against the heading at least
 * {@link MoverRuleSettings#minTravelPx} and has been followed at least {@link MoverRuleSettings#holdSeconds}, or
 * has travelled {@link MoverRuleSettings#quickTravelPx} whatever its age once it has been seen in two frames (one
 * frame's reading alone can be a lamp switched on). A steady mover (one body seen in nearly every frame at about
 * the same size, never gone back along its way: {@link #steady}) needs {@link #STEADY_TRAVEL_SHARE} of the travel
 * once followed {@link #STEADY_HOLDS} × the hold, so a crawl starts sooner. A small mover in a large zone decides
 * exactly as in a small zone: the zone's size enters nowhere.
 *
 * <pre>
 * idle ──a mover qualifies──▶ active (start) ──no member seen for clear s──▶ idle (end)
 * </pre>
 *
 * <p><b>Members.</b> The mover that started the event is its first member. Another qualifying mover joins the
 * open event when it rides with a member: near it, with no still textured ground between the two (the tracker
 * looks for it along each mover's motion, {@link Movers#stillAheadPx}), and either a small fragment of it (a
 * glare patch, a corner read apart) or, unless one of the two is a rim (a box thin along its motion: the front or back edge of a plain
 * body), not nose to tail with it (one behind the other along the motion with more than {@link #JOIN_GAP_PX}
 * between the boxes). So the front and the back rim of one plain
 * vehicle, or a pair of headlights side by side, are one passage, and two vehicles nose to tail two. A rim that
 * far behind a whole body (not a rim) never joins it, not even as a fragment: it is the front of the plain body
 * that follows ({@link #followsWholeBody}). A qualifying mover that does not ride with a member is a different one: it ends the open event at
 * once and starts its own with the next frame, so two wrong-way movers in a row are two events even when the
 * second enters before the first has left, and events of one zone never overlap. A track that picks up a member
 * the tracker lost joins too before it qualifies ({@link #continuesMember}). Otherwise the event ends when
 * no member has been seen for {@link MoverRuleSettings#clearSeconds}.
 *
 * <p><b>Rest.</b> A mover that was a member of an ended event never starts or ends another, nor does a track
 * first seen inside such a member's box while it is seen ({@link #retireBornOnRetired}). After an end, for
 * {@link MoverRuleSettings#restSeconds}, neither can a track that began within that time where the last member was lost
 * (its first point within the same distance of the member's predicted path), however late it qualifies: that is
 * the same mover picked up again after a gap (a crawler takes seconds to travel far enough again). Any
 * other mover may start an event at once; rest does not hold back the second wrong-way mover whose arrival
 * ended the event.
 *
 * <p>One instance per zone, called by the camera's analysis thread in stream-time order; no locks. Allocates
 * only when it emits an event.
 */
public final class WrongWayRule {
    /** Slack on time comparisons, seconds: stream times are sums of frame intervals and carry rounding. */
    private static final double EPSILON_SECONDS = 1e-6;
    /** Farthest a mover rides with a member, or a new track continues a lost one, analysis pixels (also: 2 × size). */
    static final double JOIN_PX = 48;
    /** A mover with at most 1/this of a member's peak samples, near it, is a fragment of it. */
    static final int FRAGMENT_SHARE = 4;
    /**
     * Widest gap, analysis pixels, between the boxes of two whole bodies (neither a rim) for them to be
     * one: three grid points at the default stride (samples of one body apart by at most two unsampled points).
     */
    static final double JOIN_GAP_PX = 12;
    /**
     * A steady mover ({@link #steady}) qualifies with this share of {@link MoverRuleSettings#minTravelPx} once it
     * has been followed {@link #STEADY_HOLDS} × {@link MoverRuleSettings#holdSeconds}: a crawl (under a pixel
     * per analysed frame) takes seconds to carry the full travel, and what else carries a share of it in that
     * time does not stay one body seen in nearly every frame that never goes back. Chosen on the suite's tune half
     * (DEVELOPERS.md, "Movers", stops 34 and 38): there shake, flicker and blizzard tracks carry 10 px over 1.5 s
     * too, but are seen in 40–77 % of their frames with sample counts varying by 0.70–3.0 of their mean; crawlers
     * in every set by 0.14–0.48. With {@link #STEADY_HOLDS}: 0.4 after 2 holds, one step inside the shares and
     * times that raise no false alert on tune (0.3 after 1.5 holds, and 0.1 after 2, let a blizzard track start
     * one).
     */
    static final double STEADY_TRAVEL_SHARE = 0.4;
    /**
     * Times the hold a steady mover must have been followed: the time a track of noise, flakes or flicker takes to
     * show that it is not one steady body. A swaying thing's half swing can be longer (the probe3 set: ±8 px
     * swings of 2.4 to 4 s start false alerts after 2 holds and after 3 alike).
     */
    static final double STEADY_HOLDS = 2;
    /** Share of the frames since it began in which a steady mover was seen. */
    static final double STEADY_SEEN_SHARE = 0.75;
    /** Most a steady mover's moving-sample count varies between sightings: standard deviation over mean. */
    static final double STEADY_SPREAD = 0.6;
    /** A track that picks up a lost member goes its way within the tracker's group angle (45°). */
    static final double COS_SAME_WAY = Math.cos(Math.toRadians(MoverSettings.GROUP_ANGLE_DEG));
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
    /** When each member's remembered place and motion were seen (its last sighting that was not a speck of it). */
    private final double[] memberPlaced = new double[MAX_MEMBERS];
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
    /** The mover whose arrival ended the last event as a different one (0: none); rest does not hold it back. */
    private long successorId;
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
        retireBornOnRetired(m);
        if (active) {
            peakShare = Math.max(peakShare, againstShare);
            for (int k = 0; k < m.capacity(); k++) {
                if (!m.live(k) || !m.seen(k)) {
                    continue;
                }
                int j = member(m.id(k));
                final boolean joins = j < 0;
                if (j < 0 && qualifies(m, k) && !retired(m.id(k))) {
                    if (!ridesWithMember(m, k, t) || members == MAX_MEMBERS) {
                        // a different wrong-way mover: this event ends, its own starts with the next frame
                        successorId = m.id(k);
                        return end(t);
                    }
                    j = members++;
                    memberId[j] = m.id(k);
                } else if (j < 0 && members < MAX_MEMBERS && !retired(m.id(k)) && continuesMember(m, k, t)) {
                    // a member's track broke and this one picked it up: the same body, before it has travelled
                    // far enough again to qualify
                    j = members++;
                    memberId[j] = m.id(k);
                }
                if (j >= 0) {
                    remember(j, m, k, t, joins);
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
        double age = m.ageSeconds(k) + EPSILON_SECONDS;
        // quick travel still needs a second sighting: one frame's reading alone can be a light switched on
        return (travel >= settings.quickTravelPx() && m.ageSeconds(k) > EPSILON_SECONDS)
                || (travel >= settings.minTravelPx() && age >= settings.holdSeconds())
                || (travel >= STEADY_TRAVEL_SHARE * settings.minTravelPx() && age >= STEADY_HOLDS * settings.holdSeconds()
                        && steady(m, k));
    }

    /**
     * Whether a mover is one steady body going one way: seen in at least {@link #STEADY_SEEN_SHARE} of the
     * frames since it began, its moving-sample count varying by at most {@link #STEADY_SPREAD} of its mean, and
     * its travel never fallen back by more than one sample spacing.
     */
    static boolean steady(Movers m, int k) {
        return m.seenFrames(k) >= STEADY_SEEN_SHARE * m.frames(k) && m.sampleSpread(k) <= STEADY_SPREAD
                && m.travelDropPx(k) <= m.stride;
    }

    /**
     * A track seen for the first time with its centroid inside the box of a retired member seen in the same frame
     * is a piece of that body (its front edge read apart, which then takes the body's groups from the member's
     * track): it is retired with it, and never starts or ends an event. With a trial flow (stop 35) probe p07 (two
     * vans in a row) raised a third start so; nothing else in any detection set changed.
     */
    private void retireBornOnRetired(Movers m) {
        for (int k = 0; k < m.capacity(); k++) {
            if (!m.live(k) || !m.seen(k) || m.ageSeconds(k) > EPSILON_SECONDS || retired(m.id(k))) {
                continue;
            }
            for (int r = 0; r < m.capacity(); r++) {
                if (r == k || !m.live(r) || !m.seen(r) || !retired(m.id(r))) {
                    continue;
                }
                if (Math.abs(m.x(k) - m.x(r)) <= 0.5 * m.widthPx(r) && Math.abs(m.y(k) - m.y(r)) <= 0.5 * m.heightPx(r)) {
                    retire(m.id(k));
                    break;
                }
            }
        }
    }

    /** Remembers a track as retired (the ring keeps the latest {@code 4 × MAX_MEMBERS}). */
    private void retire(long id) {
        retiredId[retiredNext] = id;
        retiredNext = (retiredNext + 1) % retiredId.length;
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

    private void remember(int j, Movers m, int k, double t, boolean first) {
        memberSeen[j] = t;
        if (!first && m.samples(k) * FRAGMENT_SHARE < memberSamples[j]) {
            return; // a speck of it this frame (its track may have paired with a chance cluster): place it as before
        }
        memberPlaced[j] = t;
        memberX[j] = m.x(k);
        memberY[j] = m.y(k);
        memberVx[j] = m.vx(k);
        memberVy[j] = m.vy(k);
        memberW[j] = m.widthPx(k);
        memberH[j] = m.heightPx(k);
        memberSamples[j] = m.peakSamples(k);
    }

    /**
     * One body with a member (or part of its passage): within max({@link #JOIN_PX}, twice the larger's size) of
     * the member (where it is in this frame, or where its last velocity puts it), no still ground between the two
     * ({@link #stillGroundBetween}), and either a fragment of it (at most 1/{@link #FRAGMENT_SHARE} of its peak
     * samples) or not {@link #noseToTail} with it (unless one of the two is a rim). Velocities are not compared:
     * both movers qualify, so both go against the heading, and the parts of one body read theirs poorly.
     */
    private boolean ridesWithMember(Movers m, int k, double t) {
        for (int j = 0; j < members; j++) {
            if (t - memberSeen[j] > settings.clearSeconds() + EPSILON_SECONDS) {
                continue;
            }
            final int mj = m.slot(memberId[j]);
            final boolean now = mj >= 0 && m.seen(mj);
            final double dt = now ? 0 : t - memberPlaced[j];
            final double jx = now ? m.x(mj) : memberX[j] + memberVx[j] * dt;
            final double jy = now ? m.y(mj) : memberY[j] + memberVy[j] * dt;
            final double jvx = now ? m.vx(mj) : memberVx[j];
            final double jvy = now ? m.vy(mj) : memberVy[j];
            final double jw = now ? m.widthPx(mj) : memberW[j];
            final double jh = now ? m.heightPx(mj) : memberH[j];
            final double size = Math.max(Math.max(m.widthPx(k), m.heightPx(k)), Math.max(jw, jh));
            if (Math.hypot(m.x(k) - jx, m.y(k) - jy) > Math.max(JOIN_PX, 2 * size)) {
                continue;
            }
            if (now && stillGroundBetween(m, k, mj)) {
                continue;
            }
            // no test of velocity: both qualify, so both go against the heading, and parts of one body read their
            // velocity poorly (part of a photo texture's flow, a rim, a flickering lamp's pull)
            final double speed = Math.hypot(jvx, jvy);
            if (speed > 0 && followsWholeBody(m.x(k) - jx, m.y(k) - jy, m.widthPx(k), m.heightPx(k), m.vx(k),
                    m.vy(k), jw, jh, jvx / speed, jvy / speed)) {
                continue; // the front edge of a plain body that follows a whole one, with ground between them
            }
            if (m.peakSamples(k) * FRAGMENT_SHARE <= memberSamples[j]) {
                return true;
            }
            if (speed > 0 && !rim(m.widthPx(k), m.heightPx(k), m.vx(k), m.vy(k)) && !rim(jw, jh, jvx, jvy)
                    && noseToTail(m.x(k) - jx, m.y(k) - jy, m.widthPx(k), m.heightPx(k), jw, jh, jvx / speed,
                            jvy / speed)) {
                continue; // two whole bodies one behind the other with a gap between them
            }
            return true;
        }
        return false;
    }

    /**
     * One box behind the other along the motion (ux, uy), a unit vector: across the motion their centres are no
     * farther apart than half the narrower box, and along it the gap between the boxes exceeds
     * {@link #JOIN_GAP_PX}. Pieces side by side (a pair of headlights at night) or overlapping are one body.
     */
    static boolean noseToTail(double dx, double dy, double w1, double h1, double w2, double h2, double ux, double uy) {
        final double along = Math.abs(dx * ux + dy * uy);
        final double across = Math.abs(-dx * uy + dy * ux);
        final double length1 = extent(w1, h1, ux, uy);
        final double length2 = extent(w2, h2, ux, uy);
        final double width1 = extent(w1, h1, uy, ux);
        final double width2 = extent(w2, h2, uy, ux);
        return across <= 0.5 * Math.min(width1, width2) && along - (length1 + length2) / 2 > JOIN_GAP_PX;
    }

    /**
     * A rim (the moving edge of a plain body) behind a member that is a whole body (not a rim), one behind the
     * other along the member's motion (ux, uy) with a gap of more than {@link #JOIN_GAP_PX} between their boxes:
     * a whole body's own samples reach its back, so a rim that far behind it is the front of the next body in the
     * lane, not a piece of this one, however few samples it has. (dx, dy) is the rim's centre less the member's.
     */
    static boolean followsWholeBody(double dx, double dy, double w, double h, double vx, double vy, double jw,
            double jh, double ux, double uy) {
        return dx * ux + dy * uy < 0 && rim(w, h, vx, vy) && !rim(jw, jh, ux, uy)
                && noseToTail(dx, dy, w, h, jw, jh, ux, uy);
    }

    /** A box at most half as long along its motion as across it: the moving edge of something longer. */
    static boolean rim(double w, double h, double vx, double vy) {
        final double speed = Math.hypot(vx, vy);
        if (!(speed > 0)) {
            return false;
        }
        final double ux = vx / speed;
        final double uy = vy / speed;
        return extent(w, h, ux, uy) <= 0.5 * extent(w, h, uy, ux);
    }

    /** Extent of a w × h box (axis-aligned) along the unit direction (ux, uy); (uy, ux) gives it across. */
    static double extent(double w, double h, double ux, double uy) {
        return Math.abs(ux) * w + Math.abs(uy) * h;
    }

    /**
     * True when the tracker found still textured ground between movers a and b of this frame: looking ahead along
     * its motion from the one behind, still ground comes before the body of the one ahead (its half length along
     * the motion before its centroid). Two vehicles nose to tail have such ground between them; the front and
     * the back rim of one plain vehicle have its plain (untextured) or moving inside. On plain ground there is
     * no evidence either way, and the two count as one.
     */
    static boolean stillGroundBetween(Movers m, int a, int b) {
        double vx = m.vx(a) + m.vx(b);
        double vy = m.vy(a) + m.vy(b);
        final double speed = Math.hypot(vx, vy);
        if (!(speed > 0)) {
            return false;
        }
        final double ux = vx / speed;
        final double uy = vy / speed;
        final double along = (m.x(a) - m.x(b)) * ux + (m.y(a) - m.y(b)) * uy;
        final int behind = along >= 0 ? b : a;
        final int ahead = along >= 0 ? a : b;
        final double halfLength = 0.5 * extent(m.widthPx(ahead), m.heightPx(ahead), ux, uy);
        return m.stillAheadPx(behind) < Math.abs(along) - halfLength;
    }

    /**
     * A track that picks up a member the tracker lost, while the event is open. Either it began after the member was
     * last placed and within {@link MoverRuleSettings#clearSeconds} of it, its first point within the tracker's
     * pairing gate ({@link MoverSettings#GATE_PX} plus half the member's larger side) of where the member's last
     * velocity puts it at that moment; or it was there before and has taken the member's body, so that it is now
     * within that gate of where the member would be now. Both ways it goes the member's way (within {@link
     * #COS_SAME_WAY}) at half to twice its speed, and it is not a fragment of it (at least 1/{@link #FRAGMENT_SHARE}
     * of its peak samples). A body whose track broke (a plain van read as rims that take turns, a person lost in
     * rain for a moment, or whose group another track won while its own track wandered off to a speck) goes on
     * being the event's before its new track has travelled far enough to qualify; a chance cluster's velocity
     * points anywhere.
     */
    private boolean continuesMember(Movers m, int k, double t) {
        if (m.pathCount(k) == 0) {
            return false;
        }
        final double born = t - m.ageSeconds(k);
        for (int j = 0; j < members; j++) {
            final int mj = m.slot(memberId[j]);
            if (mj >= 0 && m.seen(mj)) {
                continue; // still followed: nothing to pick up
            }
            double dt = born - memberPlaced[j];
            double px = m.pathX(k, 0);
            double py = m.pathY(k, 0);
            if (dt < -EPSILON_SECONDS && t - memberSeen[j] <= settings.clearSeconds() + EPSILON_SECONDS) {
                // a track that was already there took the member's body: where it is now against where the
                // member would be now
                dt = t - memberPlaced[j];
                px = m.x(k);
                py = m.y(k);
            }
            if (dt < -EPSILON_SECONDS || dt > settings.clearSeconds() + EPSILON_SECONDS) {
                continue;
            }
            // going the member's way at its pace (a chance cluster's velocity points anywhere), and not a
            // speck of it
            final double sk = Math.hypot(m.vx(k), m.vy(k));
            final double sj = Math.hypot(memberVx[j], memberVy[j]);
            if (!(sk > 0 && sj > 0) || m.vx(k) * memberVx[j] + m.vy(k) * memberVy[j] < COS_SAME_WAY * sk * sj
                    || sk < 0.5 * sj || sk > 2 * sj || m.peakSamples(k) * FRAGMENT_SHARE < memberSamples[j]) {
                continue;
            }
            final double d = Math.hypot(px - (memberX[j] + memberVx[j] * dt), py - (memberY[j] + memberVy[j] * dt));
            if (d <= MoverSettings.GATE_PX + 0.5 * Math.max(memberW[j], memberH[j])) {
                return true;
            }
        }
        return false;
    }

    /** During rest: a member of the ended event, or a track that began where its last member was lost. */
    private boolean restingMover(Movers m, int k, double t) {
        if (retired(m.id(k))) {
            return true;
        }
        if (m.pathCount(k) == 0) {
            return false;
        }
        if (m.id(k) == successorId) {
            return false; // the different mover that ended the last event: its own event is due
        }
        // whether a track continues the last member is decided by where and when it began, not by when it
        // qualifies: a crawler picked up again within rest takes seconds to travel far enough
        double born = t - m.ageSeconds(k);
        if (born + EPSILON_SECONDS >= restUntil) {
            return false;
        }
        double dt = born - endSeen;
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
        successorId = 0;
        eventId = UUID.randomUUID().toString();
        startedAt = t;
        lastSeen = t;
        peakShare = againstShare;
        members = 1;
        memberId[0] = m.id(k);
        remember(0, m, k, t, true);
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
            retire(memberId[j]);
        }
        int last = 0;
        for (int j = 1; j < members; j++) {
            if (memberSeen[j] > memberSeen[last]) {
                last = j;
            }
        }
        endSeen = memberPlaced[last];
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
