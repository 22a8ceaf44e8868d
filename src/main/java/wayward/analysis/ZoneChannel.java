package wayward.analysis;

import java.io.IOException;
import java.nio.file.Path;
import java.time.Clock;
import java.util.Locale;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.event.Event;
import wayward.flow.FlowField;
import wayward.rule.WrongWayRule;
import wayward.rule.ZoneRule;
import wayward.zone.HeadingLearner;
import wayward.zone.MoverSettings;
import wayward.zone.MoverTracker;
import wayward.zone.Movers;
import wayward.zone.ZoneMask;
import wayward.zone.ZoneMeter;
import wayward.zone.ZoneReading;

/**
 * One zone of a camera from reading to rule, on the analysis thread: its meter; for a zone with a heading the
 * mover tracker and the wrong-way rule, for a motion zone the share rule; and while the zone learns its heading
 * the learner instead of a rule (no events), which on success keeps what it learned and makes the zone a
 * wrong-way zone. The heading and whether it still learns are read by status threads.
 */
final class ZoneChannel {
    private static final Logger LOG = LoggerFactory.getLogger(CameraPipeline.class);

    private final CameraConfig camera;
    private final ZoneConfig zone;
    private final Clock clock;
    private volatile double heading;
    private volatile HeadingLearner learner;
    private ZoneRule shareRule;
    private WrongWayRule moverRule;
    private ZoneMeter meter;
    private MoverTracker tracker;
    private Movers movers;
    private String state = "idle";
    /** The movers the rule read in the last frame; null when no mover rule ran. */
    private Movers read;
    private final ZoneGate gate;
    /** The id of the event whose start the gate dropped: its end is dropped too. */
    private String dropped;
    /** Wall-clock milliseconds from which the zone's hours must be looked at again; MIN_VALUE before the first. */
    private long hoursCheckMillis = Long.MIN_VALUE;
    /** The open {@code zone_off_hours} event's id, or null while in hours. */
    private String offHoursId;
    private double offHoursSince;

    ZoneChannel(CameraConfig camera, ZoneConfig zone, Clock clock, ZoneGate gate) {
        this.camera = camera;
        this.zone = zone;
        this.clock = clock;
        this.gate = gate;
        this.heading = zone.headingDeg();
        if (zone.learnsHeading()) {
            learner = new HeadingLearner(zone.learnHeadingSeconds());
        } else if (zone.hasHeading()) {
            moverRule = new WrongWayRule(camera.id(), zone.id(), zone.movers(), clock);
        } else {
            shareRule = new ZoneRule(camera.id(), zone.id(), false, zone.rule(), clock);
        }
    }

    ZoneConfig zone() {
        return zone;
    }

    /** The heading in use: configured, learned, or NaN (motion zone, or still learning). */
    double heading() {
        return heading;
    }

    boolean learning() {
        return learner != null;
    }

    /** The flow's size is known (or changed): the zone's samples, its meter and its tracker. */
    void setUp(FlowField field) {
        ZoneMask mask = ZoneMask.rasterise(zone.xs(), zone.ys(), field);
        if (mask.size() == 0) {
            LOG.warn("camera {} zone {}: covers no pixel at {}x{}", camera.id(), zone.id(), field.imageWidth,
                    field.imageHeight);
        }
        meterAndTracker(mask, field);
    }

    private void meterAndTracker(ZoneMask mask, FlowField field) {
        double h = heading;
        meter = new ZoneMeter(mask, h, zone.toleranceDeg(), zone.minSpeedPxPerSecond(), zone.minConfidence(),
                camera.removeCameraMotion());
        tracker = Double.isNaN(h) ? null : new MoverTracker(mask, field, h, MoverSettings.of(
                zone.minSpeedPxPerSecond(), zone.minConfidence(), zone.toleranceDeg()), camera.removeCameraMotion());
        movers = tracker == null ? null : tracker.newMovers();
    }

    /** The flow restarted after a gap: tracks and averaged flow are forgotten. */
    void resetTracks() {
        if (tracker != null) {
            tracker.reset();
            movers.clear();
        }
    }

    /**
     * One analysed frame: fills {@code reading}, runs the rule (or the learner) and returns the event phase it
     * decided, or null.
     *
     * @param pixels     the frame the flow ended on (grey, the flow's picture size)
     * @param still      the still-frame gate found nothing changed around the zones in it
     * @param learnedDir where a learned heading is kept; null: in memory only
     */
    Event update(FlowField field, byte[] pixels, boolean still, double dt, double t, ZoneReading reading, Path learnedDir) {
        meter.measure(field, dt, t, reading);
        read = null;
        if (learner != null) {
            learn(reading, dt, field, learnedDir);
            state = "learning";
            return null;
        }
        Event e;
        if (moverRule != null) {
            tracker.update(field, pixels, still, dt, t, movers);
            e = moverRule.update(movers, reading.againstShare);
            read = movers;
            state = moverRule.stateName();
        } else {
            e = shareRule.update(reading);
            state = shareRule.stateName();
        }
        return gated(e);
    }

    /** The phase as the gate lets it through: a start while closed is dropped, and so is its end. */
    private Event gated(Event e) {
        if (e == null) {
            return null;
        }
        if (e.phase() == Event.Phase.START && !(inHours(e.at()) && gate.raises(camera.id(), zone.id(), e.at()))) {
            dropped = e.id();
            LOG.info("camera {} zone {}: a {} starts while the zone raises no events (muted or off hours); not raised",
                    camera.id(), zone.id(), e.kind().jsonName());
            return null;
        }
        if (e.phase() == Event.Phase.END && e.id().equals(dropped)) {
            dropped = null;
            return null;
        }
        return e;
    }

    private boolean inHours(java.time.Instant at) {
        return !zone.hasHours() || zone.hours().on(at);
    }

    /**
     * One analysed frame at stream time {@code t}: a {@code zone_off_hours} start when the zone's hours have ended
     * (or the zone starts outside them), its end when they begin again; otherwise null. Reads the clock's
     * milliseconds once and allocates nothing until the cached next change has passed.
     */
    Event hours(double t) {
        if (!zone.hasHours() || clock.millis() < hoursCheckMillis) {
            return null;
        }
        ZoneHours h = zone.hours();
        java.time.Instant now = clock.instant();
        boolean on = h.on(now);
        java.time.Instant next = h.nextChange(now);
        hoursCheckMillis = next == null ? Long.MAX_VALUE : next.toEpochMilli();
        if (!on && offHoursId == null) {
            offHoursId = java.util.UUID.randomUUID().toString();
            offHoursSince = t;
            LOG.info("camera {} zone {}: off hours until {}; its rule raises no events meanwhile", camera.id(),
                    zone.id(), next == null ? "never" : next.atZone(h.timeZone()).toOffsetDateTime());
            return offHours(Event.Phase.START, t, now, new Event.Control(next, null, h.offReason(now)));
        }
        if (on && offHoursId != null) {
            Event e = offHours(Event.Phase.END, t, now, new Event.Control(next, null, "in hours " + h));
            offHoursId = null;
            return e;
        }
        return null;
    }

    private Event offHours(Event.Phase phase, double t, java.time.Instant now, Event.Control control) {
        return new Event(offHoursId, camera.id(), zone.id(), wayward.event.EventKind.ZONE_OFF_HOURS, phase, t, now,
                Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                phase == Event.Phase.END ? Math.max(0, t - offHoursSince) : Double.NaN, null, null, null, null, null,
                null, control);
    }

    /** The rule's state after the last frame: idle, active, or learning. */
    String state() {
        return state;
    }

    /** The movers of the last frame for a zone whose mover rule ran, else null. */
    Movers movers() {
        return read;
    }

    /** Closes an open event at the end of the stream; returns its end phase or null. */
    Event finish(double t) {
        return gated(shareRule != null ? shareRule.finish(t) : moverRule != null ? moverRule.finish(t) : null);
    }

    /** A heading learned earlier (data_dir/learned): used at once. */
    void useLearned(double h, FlowField field) {
        heading = h;
        learner = null;
        moverRule = new WrongWayRule(camera.id(), zone.id(), zone.movers(), clock);
        if (meter != null) {
            meterAndTracker(meter.mask(), field);
        }
    }

    private void learn(ZoneReading reading, double dt, FlowField field, Path learnedDir) {
        HeadingLearner l = learner;
        l.add(reading, dt);
        double h = l.heading();
        if (Double.isNaN(h)) {
            return;
        }
        LOG.info("camera {} zone {}: learned heading {}° from {} s of traffic; alerts on movement against it from now",
                camera.id(), zone.id(), String.format(Locale.ROOT, "%.1f", h),
                String.format(Locale.ROOT, "%.0f", l.movingSeconds()));
        useLearned(h, field);
        if (learnedDir != null) {
            Path f = LearnedHeadings.file(learnedDir, zone.id());
            try {
                LearnedHeadings.write(f, h, l.movingSeconds());
            } catch (IOException e) {
                LOG.warn("camera {} zone {}: cannot keep the learned heading in {} ({}); it is learned again next start",
                        camera.id(), zone.id(), f, e.toString());
            }
        }
    }
}
