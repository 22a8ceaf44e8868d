package wayward.analysis;

import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.UUID;
import java.util.function.Consumer;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.capture.VideoSource;
import wayward.event.Event;
import wayward.event.EventKind;

/** Turns a source's health into camera_lost / camera_back events (capture thread; never blocks). */
final class HealthEvents implements VideoSource.Health {
    private static final Logger LOG = LoggerFactory.getLogger(CameraPipeline.class);

    private final String camera;
    private final Consumer<Event> events;
    private final Clock clock;
    private String outageId;
    private Instant lostAt;

    HealthEvents(String camera, Consumer<Event> events, Clock clock) {
        this.camera = camera;
        this.events = events;
        this.clock = clock;
    }

    @Override
    public void lost(String reason, double streamSeconds) {
        outageId = UUID.randomUUID().toString();
        lostAt = clock.instant();
        LOG.warn("camera {}: lost ({})", camera, reason);
        events.accept(new Event(outageId, camera, null, EventKind.CAMERA_LOST, Event.Phase.START, streamSeconds,
                lostAt, Double.NaN, Double.NaN, Double.NaN, Double.NaN));
    }

    @Override
    public void back(double streamSeconds) {
        Instant now = clock.instant();
        double outage = Duration.between(lostAt, now).toMillis() / 1000.0;
        LOG.info("camera {}: back after {} s", camera, outage);
        events.accept(new Event(outageId, camera, null, EventKind.CAMERA_BACK, Event.Phase.END, streamSeconds, now,
                Double.NaN, Double.NaN, Double.NaN, outage));
    }
}
