package wayward.analysis;

import java.util.concurrent.atomic.AtomicLongArray;
import wayward.zone.ZoneReading;

/**
 * Each zone's latest moving share and share against its heading, and its events so far: written by the analysis
 * thread, read by any (status, metrics).
 */
final class ZoneFigures {
    private final AtomicLongArray movingShare;
    private final AtomicLongArray againstShare;
    private final AtomicLongArray events;

    ZoneFigures(int zones) {
        movingShare = new AtomicLongArray(zones);
        againstShare = new AtomicLongArray(zones);
        events = new AtomicLongArray(zones);
        for (int z = 0; z < zones; z++) {
            movingShare.set(z, Double.doubleToRawLongBits(Double.NaN));
            againstShare.set(z, Double.doubleToRawLongBits(Double.NaN));
        }
    }

    void read(int zone, ZoneReading r) {
        movingShare.set(zone, Double.doubleToRawLongBits(r.movingShare));
        againstShare.set(zone, Double.doubleToRawLongBits(r.againstShare));
    }

    void started(int zone) {
        events.incrementAndGet(zone);
    }

    double movingShare(int zone) {
        return Double.longBitsToDouble(movingShare.get(zone));
    }

    double againstShare(int zone) {
        return Double.longBitsToDouble(againstShare.get(zone));
    }

    long events(int zone) {
        return events.get(zone);
    }
}
