package wayward.analysis;

import java.awt.image.BufferedImage;
import java.util.List;
import java.util.concurrent.locks.ReentrantLock;
import wayward.clip.Snapshot;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;
import wayward.zone.ZoneMask;
import wayward.zone.ZoneMeter;
import wayward.zone.ZoneReading;

/**
 * A camera's latest analysis frame and flow field for the live view, copied by the analysis thread only while
 * someone watches (at most every 150 ms, and never waiting: a copy is skipped while a viewer renders). The
 * status server renders pictures and measures drawn zones from the copy on its own thread.
 */
public final class LiveView {
    private static final long WATCH_NANOS = 5_000_000_000L;
    private static final long EVERY_NANOS = 150_000_000L;

    private final ReentrantLock lock = new ReentrantLock();
    private volatile long wantedUntil;
    private long lastCopy;
    // guarded by lock
    private GrayFrame frame;
    private FlowField field;
    private double dt;
    private long copies;

    /** A viewer asks for pictures; copying goes on for 5 s after the last ask. Any thread. */
    public void want() {
        wantedUntil = System.nanoTime() + WATCH_NANOS;
    }

    /** Analysis thread: copies the pair's later frame and its field when wanted and due. */
    void offer(GrayFrame f, FlowField fl, double frameSeconds) {
        long now = System.nanoTime();
        if (now - wantedUntil > 0 || now - lastCopy < EVERY_NANOS || !lock.tryLock()) {
            return;
        }
        try {
            if (frame == null || frame.width != f.width || frame.height != f.height) {
                frame = new GrayFrame(f.width, f.height); // once per resolution
            }
            frame.copyFrom(f);
            if (field == null || field.width != fl.width || field.height != fl.height || field.stride != fl.stride) {
                field = new FlowField(fl.imageWidth, fl.imageHeight, fl.stride);
            }
            field.copyFrom(fl);
            dt = frameSeconds;
            copies++;
            lastCopy = now;
        } finally {
            lock.unlock();
        }
    }

    /** Copies taken so far; a viewer sends a new picture only when this moved. */
    public long copies() {
        lock.lock();
        try {
            return copies;
        } finally {
            lock.unlock();
        }
    }

    /** The picture with zones, their headings in use (configured or learned) and flow arrows, or null before the first copy. */
    public BufferedImage render(List<ZoneConfig> zones, double[] headingsInUse, double minStepPixels) {
        lock.lock();
        try {
            return frame == null ? null : Snapshot.live(frame, field, ZoneConfig.xsOf(zones),
                    ZoneConfig.ysOf(zones), headingsInUse, minStepPixels);
        } finally {
            lock.unlock();
        }
    }

    /**
     * Measures a zone that is not in the config (one being drawn) on the latest copy, or null before the first
     * copy.
     */
    public ZoneReading measure(double[] xs, double[] ys, double headingDeg, double toleranceDeg, double minSpeed,
            double minConfidence, boolean removeCameraMotion) {
        lock.lock();
        try {
            if (field == null) {
                return null;
            }
            ZoneMeter meter = new ZoneMeter(ZoneMask.rasterise(xs, ys, field), headingDeg, toleranceDeg, minSpeed,
                    minConfidence, removeCameraMotion);
            ZoneReading r = new ZoneReading();
            meter.measure(field, dt, 0, r);
            return r;
        } finally {
            lock.unlock();
        }
    }
}
