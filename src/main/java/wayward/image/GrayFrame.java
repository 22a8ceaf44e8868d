package wayward.image;

/**
 * A gray 8-bit picture at analysis size with its stream time. A mutable buffer: the capture thread fills one,
 * hands it over through a frame slot and later refills it; nothing is allocated per frame.
 */
public final class GrayFrame {
    public final int width;
    public final int height;
    /** Row-major luma, stride = width, values 0..255 as unsigned bytes. Owned by this frame. */
    public final byte[] pixels;
    /** Seconds since the stream's first frame (stream timestamps, not wall clock). */
    public double streamSeconds;
    /** Count of decoded frames before this one in the stream (0-based). */
    public long frameIndex;

    public GrayFrame(int width, int height) {
        if (width < 1 || height < 1) {
            throw new IllegalArgumentException("size: " + width + "x" + height + " (expected at least 1x1)");
        }
        this.width = width;
        this.height = height;
        this.pixels = new byte[width * height];
    }

    /** Copies pixels and times from another frame of the same size. Does not allocate. */
    public void copyFrom(GrayFrame other) {
        if (other.width != width || other.height != height) {
            throw new IllegalArgumentException("size: " + other.width + "x" + other.height
                    + " (expected " + width + "x" + height + ")");
        }
        System.arraycopy(other.pixels, 0, pixels, 0, pixels.length);
        streamSeconds = other.streamSeconds;
        frameIndex = other.frameIndex;
    }
}
