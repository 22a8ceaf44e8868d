package wayward.capture;

import wayward.image.GrayFrame;

/**
 * Hands analysis frames from the capture thread (one writer) to the analysis thread (one reader) through three
 * reused buffers. In live mode the newest frame wins: a frame not taken before the next is published is
 * dropped and counted, so capture never waits for analysis. In lossless mode (replay of a file) the writer
 * waits until the reader has taken the previous frame, so every frame is analysed.
 */
public final class FrameSlot {
    private final boolean lossless;
    private GrayFrame back;
    private GrayFrame middle;
    private GrayFrame front;
    private boolean fresh;
    private boolean closed;
    private long published;
    private long dropped;

    public FrameSlot(boolean lossless) {
        this.lossless = lossless;
    }

    /**
     * Writer side: the buffer to fill next, of the given size. Allocates three buffers on the first call and
     * whenever the size changes; otherwise returns a reused one.
     */
    public synchronized GrayFrame writable(int width, int height) {
        if (back == null || back.width != width || back.height != height) {
            back = new GrayFrame(width, height);
            middle = new GrayFrame(width, height);
            front = new GrayFrame(width, height);
            fresh = false;
        }
        return back;
    }

    /**
     * Writer side: publishes the buffer last returned by {@link #writable}. In lossless mode waits while the
     * previous frame is untaken; returns false when the slot was closed meanwhile.
     */
    public synchronized boolean publish() throws InterruptedException {
        if (lossless) {
            while (fresh && !closed) {
                wait();
            }
        }
        if (closed) {
            return false;
        }
        GrayFrame t = middle;
        middle = back;
        back = t;
        if (fresh) {
            dropped++;
        }
        fresh = true;
        published++;
        notifyAll();
        return true;
    }

    /**
     * Reader side: the newest unread frame, waiting at most {@code timeoutMillis}. Returns null on timeout, or
     * when the slot is closed and drained. The frame stays valid until the next call.
     */
    public synchronized GrayFrame take(long timeoutMillis) throws InterruptedException {
        long deadline = System.nanoTime() + timeoutMillis * 1_000_000L;
        while (!fresh && !closed) {
            long left = deadline - System.nanoTime();
            if (left <= 0) {
                return null;
            }
            wait(Math.max(1, left / 1_000_000L));
        }
        if (!fresh) {
            return null;
        }
        GrayFrame t = front;
        front = middle;
        middle = t;
        fresh = false;
        notifyAll();
        return front;
    }

    /** No more frames will come (end of file, shutdown). Wakes both sides. */
    public synchronized void close() {
        closed = true;
        notifyAll();
    }

    /** True once closed and every published frame has been taken. */
    public synchronized boolean drained() {
        return closed && !fresh;
    }

    public synchronized long published() {
        return published;
    }

    /** Frames replaced before the reader took them (live mode only). */
    public synchronized long dropped() {
        return dropped;
    }
}
