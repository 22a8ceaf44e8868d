package wayward.analysis;

import java.time.Clock;
import java.time.Instant;
import java.util.UUID;
import java.util.function.Consumer;
import java.util.function.LongSupplier;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.capture.VideoSource;
import wayward.event.Event;
import wayward.event.EventKind;

/**
 * Turns a source's health into camera_lost events (capture thread; never blocks): the start when the camera is
 * lost, the end (same kind, same id) when it delivers pictures again and is watched once more. The outage's
 * length is measured on the monotonic clock: a wall clock stepped by NTP meanwhile changes {@code at}, never the
 * duration.
 */
final class HealthEvents implements VideoSource.Health {
    private static final Logger LOG = LoggerFactory.getLogger(CameraPipeline.class);

    private final String camera;
    /** Which of a two-stream camera's streams this watches ({@link Event#SOURCE}, {@link Event#ANALYSIS_SOURCE}), or null. */
    private final String stream;
    private final Consumer<Event> events;
    private final Clock clock;
    private final LongSupplier nanos;
    private String outageId;
    private long lostNanos;

    HealthEvents(String camera, Consumer<Event> events, Clock clock) {
        this(camera, null, events, clock, System::nanoTime);
    }

    /** @param stream which stream of a two-stream camera ({@link Event#SOURCE} or {@link Event#ANALYSIS_SOURCE}) */
    HealthEvents(String camera, String stream, Consumer<Event> events, Clock clock) {
        this(camera, stream, events, clock, System::nanoTime);
    }

    /** @param nanos a monotonic clock, nanoseconds (System::nanoTime; tests give their own) */
    HealthEvents(String camera, Consumer<Event> events, Clock clock, LongSupplier nanos) {
        this(camera, null, events, clock, nanos);
    }

    /**
     * @param stream which stream of a two-stream camera, null for a camera with one
     * @param nanos  a monotonic clock, nanoseconds (System::nanoTime; tests give their own)
     */
    HealthEvents(String camera, String stream, Consumer<Event> events, Clock clock, LongSupplier nanos) {
        this.camera = camera;
        this.stream = stream;
        this.events = events;
        this.clock = clock;
        this.nanos = nanos;
    }

    @Override
    public void lost(String reason, double streamSeconds) {
        outageId = UUID.randomUUID().toString();
        lostNanos = nanos.getAsLong();
        Instant lostAt = clock.instant();
        LOG.warn("camera {}: {}lost ({})", camera, stream == null ? "" : stream + " ", reason);
        events.accept(new Event(outageId, camera, null, EventKind.CAMERA_LOST, Event.Phase.START, streamSeconds,
                lostAt, Double.NaN, Double.NaN, Double.NaN, Double.NaN).withStream(stream));
    }

    @Override
    public void back(double streamSeconds) {
        Instant now = clock.instant();
        double outage = Math.round((nanos.getAsLong() - lostNanos) / 1e6) / 1000.0;
        LOG.info("camera {}: {}watching again after {} s lost", camera, stream == null ? "" : stream + " ", outage);
        events.accept(new Event(outageId, camera, null, EventKind.CAMERA_LOST, Event.Phase.END, streamSeconds, now,
                Double.NaN, Double.NaN, Double.NaN, outage).withStream(stream));
    }
}
