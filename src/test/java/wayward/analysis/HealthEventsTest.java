package wayward.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicLong;
import org.junit.jupiter.api.Test;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;
import wayward.testing.SchemaCheck;
import wayward.testing.SteppingClock;

/** An outage measured while NTP steps the wall clock: fake wall and monotonic clocks, no waiting. */
class HealthEventsTest {
    @Test
    void aWallClockSteppedBackOrForwardDoesNotChangeTheOutagesLength() {
        SteppingClock clock = new SteppingClock(Instant.parse("2026-12-03T08:00:00Z"));
        AtomicLong mono = new AtomicLong(5_000_000_000L);
        List<Event> events = new ArrayList<>();
        HealthEvents h = new HealthEvents("yard-mast-2", events::add, clock, mono::get);
        for (long stepSeconds : new long[] {-3600, 3600}) {
            events.clear();
            h.lost("stream ended", 10.0);
            clock.step(stepSeconds); // NTP steps the wall clock during the outage
            mono.addAndGet(12_500_000_000L); // 12.5 s pass
            h.back(22.5);
            // one kind for both phases: the end says the camera is watched again
            assertEquals(List.of(EventKind.CAMERA_LOST, EventKind.CAMERA_LOST), events.stream().map(Event::kind).toList());
            assertEquals(List.of(Event.Phase.START, Event.Phase.END), events.stream().map(Event::phase).toList());
            assertEquals(12.5, events.get(1).durationSeconds(), 1e-9, "step " + stepSeconds + " s");
            assertEquals(events.get(0).id(), events.get(1).id());
            events.forEach(e -> SchemaCheck.assertEventRecord(EventJson.toJson(e)));
        }
    }
}
