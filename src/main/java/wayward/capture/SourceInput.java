package wayward.capture;

/**
 * Options for opening a source.
 *
 * @param rtspTransport "tcp" or "udp" (RTSP sources)
 * @param deviceSize    "WIDTHxHEIGHT" asked of a webcam, or null for its default
 * @param deviceFps     frame rate asked of a webcam, or 0 for its default
 * @param deviceFormat  pixel or compression format asked of a webcam ("mjpeg", "yuyv422", ...), or null
 * @param lostAfterSeconds a network source silent this long (opening or reading) is given up and reopened
 */
public record SourceInput(String rtspTransport, String deviceSize, double deviceFps, String deviceFormat,
        double lostAfterSeconds) {
    /** Default of {@link #lostAfterSeconds}, seconds. */
    public static final double LOST_AFTER_SECONDS = 5;
    public static final double MIN_LOST_AFTER_SECONDS = 3;
    public static final double MAX_LOST_AFTER_SECONDS = 60;
    public static final SourceInput DEFAULTS = new SourceInput("tcp", null, 0, null, LOST_AFTER_SECONDS);

    /**
     * FFmpeg's socket timeout for {@link #lostAfterSeconds}, microseconds: FFmpeg gives a silent RTSP server two
     * socket timeouts and about a second more before its open fails (measured with FFmpeg 8 on loopback: 10.9 s
     * at a 5 s timeout, 6.1 s at 2.5 s, 5.2–5.6 s at 2 s), so the timeout is (lost after − 2 s) / 2.
     */
    public long socketTimeoutMicros() {
        return (long) ((lostAfterSeconds - 2) / 2 * 1e6);
    }
}
