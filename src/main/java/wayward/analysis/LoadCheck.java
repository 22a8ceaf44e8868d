package wayward.analysis;

import java.util.Locale;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The analysis rate a camera actually reaches, checked every so often by the service's watcher. When the analysis
 * thread cannot keep up, the frame slot hands it the newest picture and drops the stale ones, so capture never
 * falls behind the camera and the analysis rate sinks instead; this logs when that begins and ends.
 */
final class LoadCheck {
    private static final Logger LOG = LoggerFactory.getLogger(CameraPipeline.class);

    private final String camera;
    private final double targetFps;
    private long analysed;
    private long dropped;
    private boolean behind;
    private volatile double fps = Double.NaN;
    /** When the camera started (System.nanoTime), MIN_VALUE before; set on start, read by any thread. */
    private volatile long startedNanos = Long.MIN_VALUE;

    LoadCheck(String camera, double targetFps) {
        this.camera = camera;
        this.targetFps = targetFps;
    }

    /** The camera starts now (the watcher's first check follows about 30 s later). */
    void started(long nanoTime) {
        startedNanos = nanoTime;
    }

    /**
     * Frames analysed per second over the last check; before the first check, over the time since the start
     * ({@code analysedNow} frames in {@code nowNanos - start}); 0 before the start. Never NaN: a gauge that is NaN
     * or absent for its first 30 s breaks sums and averages over cameras and alert rules on a low rate, and the
     * Prometheus instrumentation practice is to export a series from the start rather than leave it missing.
     */
    double fps(long analysedNow, long nowNanos) {
        double checked = fps;
        if (!Double.isNaN(checked)) {
            return checked;
        }
        long since = startedNanos;
        if (since == Long.MIN_VALUE || nowNanos - since <= 0) {
            return 0;
        }
        return analysedNow / ((nowNanos - since) / 1e9);
    }

    /** One check, {@code seconds} after the last, with the counts of analysed and dropped frames so far. */
    void check(double seconds, long analysedNow, long droppedNow) {
        long da = analysedNow - analysed;
        long dd = droppedNow - dropped;
        analysed = analysedNow;
        dropped = droppedNow;
        fps = da / seconds;
        boolean nowBehind = dd > 0.1 * (da + dd);
        if (nowBehind == behind) {
            return;
        }
        behind = nowBehind;
        if (nowBehind) {
            LOG.warn("camera {}: analysis cannot keep up: {} of {} due frames analysed in the last {} s ({} a "
                    + "second instead of {}); the newest frame is always taken, the rest dropped", camera, da,
                    da + dd, (long) seconds, String.format(Locale.ROOT, "%.1f", fps), targetFps);
        } else {
            LOG.info("camera {}: analysis keeps up again ({} frames a second)", camera,
                    String.format(Locale.ROOT, "%.1f", fps));
        }
    }
}
