package wayward.testing;

import java.time.Clock;
import java.time.Instant;
import java.time.ZoneId;
import java.time.ZoneOffset;

/** A wall clock that stands still until a test steps it, back or forward (as NTP does). */
public final class SteppingClock extends Clock {
    private volatile Instant now;

    public SteppingClock(Instant start) {
        this.now = start;
    }

    /** Steps the clock by that many seconds (negative: back). */
    public void step(long seconds) {
        now = now.plusSeconds(seconds);
    }

    @Override
    public ZoneOffset getZone() {
        return ZoneOffset.UTC;
    }

    @Override
    public Clock withZone(ZoneId zone) {
        return this;
    }

    @Override
    public Instant instant() {
        return now;
    }
}
