package wayward.capture;

import wayward.secret.Urls;

/** The kinds of video source: a file, a network URL or a webcam device. */
public final class Sources {
    private Sources() {
    }

    /** A webcam device (Video4Linux2), such as /dev/video0. */
    public static boolean isDevice(String source) {
        return source.startsWith("/dev/video");
    }

    /** A source that runs on its own and is reconnected when it stops: a URL or a device. */
    public static boolean isLive(String source) {
        return Urls.isUrl(source) || isDevice(source);
    }
}
