package wayward.capture;

/**
 * Options for opening a source.
 *
 * @param rtspTransport "tcp" or "udp" (RTSP sources)
 * @param deviceSize    "WIDTHxHEIGHT" asked of a webcam, or null for its default
 * @param deviceFps     frame rate asked of a webcam, or 0 for its default
 * @param deviceFormat  pixel or compression format asked of a webcam ("mjpeg", "yuyv422", ...), or null
 */
public record SourceInput(String rtspTransport, String deviceSize, double deviceFps, String deviceFormat) {
    public static final SourceInput DEFAULTS = new SourceInput("tcp", null, 0, null);
}
