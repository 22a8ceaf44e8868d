package wayward.analysis;

import java.util.concurrent.atomic.AtomicLongArray;
import wayward.zone.ZoneReading;

/**
 * Each zone's latest coverage and share against its heading, and its events so far: written by the analysis
 * thread, read by any (status, metrics).
 */
final class ZoneFigures {
    private final AtomicLongArray coverage;
    private final AtomicLongArray against;
    private final AtomicLongArray events;

    ZoneFigures(int zones) {
        coverage = new AtomicLongArray(zones);
        against = new AtomicLongArray(zones);
        events = new AtomicLongArray(zones);
        for (int z = 0; z < zones; z++) {
            coverage.set(z, Double.doubleToRawLongBits(Double.NaN));
            against.set(z, Double.doubleToRawLongBits(Double.NaN));
        }
    }

    void read(int zone, ZoneReading r) {
        coverage.set(zone, Double.doubleToRawLongBits(r.coverage));
        against.set(zone, Double.doubleToRawLongBits(r.against));
    }

    void started(int zone) {
        events.incrementAndGet(zone);
    }

    double coverage(int zone) {
        return Double.longBitsToDouble(coverage.get(zone));
    }

    double against(int zone) {
        return Double.longBitsToDouble(against.get(zone));
    }

    long events(int zone) {
        return events.get(zone);
    }
}
