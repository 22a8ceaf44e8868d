package wayward.rule;

import java.time.Clock;
import java.util.UUID;
import wayward.event.Event;
import wayward.event.EventKind;
import wayward.zone.ZoneReading;

/**
 * Turns a zone's readings into events with hysteresis, on stream time. The signal is the share of the zone
 * moving against its heading ({@code wrong_way}), or the share moving at all for a zone without heading
 * ({@code motion}).
 *
 * <pre>
 * idle ──signal ≥ onset──▶ pending ──held ≥ hold s──▶ active (start) ──below release ≥ clear s──▶ resting (end)
 *   ▲                         │ signal &lt; release                                                      │
 *   └─────────────────────────┴───────────────────────────── rest s passed ◀──────────────────────────────┘
 * </pre>
 *
 * One instance per zone, called by the camera's analysis thread in stream-time order; no locks. Allocates only
 * when it emits an event.
 */
public final class ZoneRule {
    private enum State { IDLE, PENDING, ACTIVE, RESTING }

    /** Slack on time comparisons, seconds: stream times are sums of frame intervals and carry rounding. */
    private static final double EPSILON_SECONDS = 1e-6;

    private final String camera;
    private final String zone;
    private final EventKind kind;
    private final RuleSettings settings;
    private final Clock clock;

    private State state = State.IDLE;
    private double pendingSince;
    private double lastPresent;
    private double restUntil;
    private double startedAt;
    private String eventId;
    // measurements accumulated since the condition appeared
    private int samples;
    private double sumCoverage;
    private double peakCoverage;
    private double sumSpeed;
    private double sumX;
    private double sumY;

    public ZoneRule(String camera, String zone, boolean hasHeading, RuleSettings settings, Clock clock) {
        this.camera = camera;
        this.zone = zone;
        this.kind = hasHeading ? EventKind.WRONG_WAY : EventKind.MOTION;
        this.settings = settings;
        this.clock = clock;
    }

    public EventKind kind() {
        return kind;
    }

    /** True while an event is open (started, not yet ended). */
    public boolean active() {
        return state == State.ACTIVE;
    }

    /** Current rule state as a word for status pages: idle, pending, active or resting. */
    public String stateName() {
        return state.name().toLowerCase(java.util.Locale.ROOT);
    }

    /** Pending: distance the movement against the heading has carried since the pending phase began. */
    private double travel;
    private double lastT;

    /**
     * Feeds one reading; readings must come in increasing stream time.
     *
     * @return the event phase this reading decided, or null
     */
    public Event update(ZoneReading r) {
        final double t = r.streamSeconds;
        final boolean wrongWay = kind == EventKind.WRONG_WAY;
        final double signal = wrongWay ? r.againstShare : r.movingShare;
        if (state == State.RESTING && t + EPSILON_SECONDS >= restUntil) {
            state = State.IDLE;
        }
        switch (state) {
            case IDLE:
                if (signal >= settings.onsetLevel()) {
                    state = State.PENDING;
                    pendingSince = t;
                    travel = 0;
                    lastT = t;
                    clearMeasurements();
                    accumulate(r, signal, wrongWay);
                    return startIfHeld(t);
                }
                return null;
            case PENDING:
                if (signal < settings.releaseLevel()) {
                    state = State.IDLE;
                    return null;
                }
                if (wrongWay && !Double.isNaN(r.againstSpeedPxPerSecond)) {
                    travel += r.againstSpeedPxPerSecond * (t - lastT); // px/s × s: how far the movement against carried
                }
                lastT = t;
                accumulate(r, signal, wrongWay);
                return startIfHeld(t);
            case ACTIVE:
                if (signal >= settings.releaseLevel()) {
                    lastPresent = t;
                    peakCoverage = Math.max(peakCoverage, signal);
                    accumulate(r, signal, wrongWay);
                    return null;
                }
                if (t - lastPresent + EPSILON_SECONDS >= settings.clearSeconds()) {
                    return end(t);
                }
                return null;
            default:
                return null;
        }
    }

    /** Ends an open event at the end of the stream (replay); returns the end phase or null. */
    public Event finish(double streamSeconds) {
        if (state == State.ACTIVE) {
            return end(streamSeconds);
        }
        state = State.IDLE;
        return null;
    }

    private Event startIfHeld(double t) {
        boolean held = t - pendingSince + EPSILON_SECONDS >= settings.holdSeconds();
        if (kind == EventKind.WRONG_WAY) {
            boolean quick = travel + 1e-6 >= settings.quickTravelPx();
            if (!quick && (!held || travel + 1e-6 < settings.minTravelPx())) {
                return null;
            }
        } else if (!held) {
            return null;
        }
        state = State.ACTIVE;
        lastPresent = t;
        startedAt = t;
        eventId = UUID.randomUUID().toString();
        return new Event(eventId, camera, zone, kind, Event.Phase.START, t, clock.instant(),
                meanHeading(), sumSpeed / samples, sumCoverage / samples, Double.NaN);
    }

    private Event end(double t) {
        state = State.RESTING;
        restUntil = t + settings.restSeconds();
        return new Event(eventId, camera, zone, kind, Event.Phase.END, t, clock.instant(),
                meanHeading(), sumSpeed / Math.max(1, samples), peakCoverage, t - startedAt);
    }

    private void clearMeasurements() {
        samples = 0;
        sumCoverage = 0;
        peakCoverage = 0;
        sumSpeed = 0;
        sumX = 0;
        sumY = 0;
    }

    private void accumulate(ZoneReading r, double signal, boolean wrongWay) {
        double heading = wrongWay ? r.againstBearingDeg : r.movingBearingDeg;
        double speed = wrongWay ? r.againstSpeedPxPerSecond : r.movingSpeedPxPerSecond;
        samples++;
        sumCoverage += signal;
        peakCoverage = Math.max(peakCoverage, signal);
        sumSpeed += speed;
        if (!Double.isNaN(heading)) {
            // circular mean, weighted by how much of the zone moves that way
            double rad = Math.toRadians(heading);
            sumX += Math.sin(rad) * signal;
            sumY += Math.cos(rad) * signal;
        }
    }

    private double meanHeading() {
        if (sumX == 0 && sumY == 0) {
            return Double.NaN;
        }
        double b = Math.toDegrees(Math.atan2(sumX, sumY));
        return b < 0 ? b + 360 : b;
    }
}
