package wayward.capture;

import static org.bytedeco.ffmpeg.global.avcodec.avcodec_alloc_context3;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_find_decoder;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_free_context;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_open2;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_parameters_to_context;
import static org.bytedeco.ffmpeg.global.avformat.av_find_best_stream;
import static org.bytedeco.ffmpeg.global.avutil.AVMEDIA_TYPE_VIDEO;

import org.bytedeco.ffmpeg.avcodec.AVCodec;
import org.bytedeco.ffmpeg.avcodec.AVCodecContext;
import org.bytedeco.ffmpeg.avformat.AVFormatContext;
import org.bytedeco.ffmpeg.avformat.AVStream;
import org.bytedeco.ffmpeg.avutil.AVDictionary;
import org.bytedeco.ffmpeg.avutil.AVRational;
import org.bytedeco.javacv.FFmpegFrameGrabber;
import wayward.secret.Urls;

/**
 * One pass's video input: the grabber with the options its kind of source needs, and, once the grabber has
 * started, the best video stream with a single-threaded decoder of our own that skips the deblocking filter
 * (10–20 % of H.264 decode time here; the shrink to analysis size averages block edges out anyway, and only
 * analysis sees these pictures: clips are copies of the packets).
 */
final class VideoDecoder implements AutoCloseable {
    final int streamIndex;
    final AVStream stream;
    final AVCodecContext context;
    /** Seconds per unit of the stream's timestamps. */
    final double timeBase;
    /** The container makes timestamps up at an assumed rate (multipart JPEG). */
    final boolean untimed;
    /** One frame at the stream's average rate, seconds; NaN when it names none. */
    final double nominalFrameSeconds;

    /** A grabber for {@code options}' source, not started. */
    static FFmpegFrameGrabber grabber(SourceOptions options) {
        FFmpegFrameGrabber grabber = new FFmpegFrameGrabber(options.source());
        // The grabber opens a decoder of its own that we never use: keep it to one thread.
        grabber.setVideoOption("threads", "1");
        if (options.source().startsWith("rtsp://") || options.source().startsWith("rtsps://")) {
            grabber.setOption("rtsp_transport", options.input().rtspTransport());
        }
        if (Sources.isDevice(options.source())) {
            grabber.setFormat("video4linux2");
            if (options.input().deviceSize() != null) {
                grabber.setOption("video_size", options.input().deviceSize());
            }
            if (options.input().deviceFps() > 0) {
                grabber.setOption("framerate", Double.toString(options.input().deviceFps()));
            }
            if (options.input().deviceFormat() != null) {
                grabber.setOption("input_format", options.input().deviceFormat());
            }
        }
        if (Urls.isUrl(options.source())) {
            grabber.setOption("timeout", Long.toString(options.input().socketTimeoutMicros()));
            grabber.setOption("analyzeduration", "500000");
        }
        return grabber;
    }

    /** Opens the decoder of the best video stream of a started grabber's input; IllegalStateException if none. */
    VideoDecoder(AVFormatContext fmt) {
        String formatName = fmt.iformat() != null && fmt.iformat().name() != null ? fmt.iformat().name().getString()
                : "";
        untimed = formatName.equals("mpjpeg") || formatName.equals("mjpeg");
        streamIndex = av_find_best_stream(fmt, AVMEDIA_TYPE_VIDEO, -1, -1, (AVCodec) null, 0);
        if (streamIndex < 0) {
            throw new IllegalStateException("no video stream");
        }
        stream = fmt.streams(streamIndex);
        AVCodec codec = avcodec_find_decoder(stream.codecpar().codec_id());
        if (codec == null) {
            throw new IllegalStateException("no decoder for codec id " + stream.codecpar().codec_id());
        }
        context = avcodec_alloc_context3(codec);
        try {
            check(avcodec_parameters_to_context(context, stream.codecpar()), "copy codec parameters");
            context.thread_count(1);
            context.pkt_timebase(stream.time_base());
            context.skip_loop_filter(org.bytedeco.ffmpeg.global.avcodec.AVDISCARD_ALL);
            check(avcodec_open2(context, codec, (AVDictionary) null), "open decoder");
        } catch (RuntimeException e) {
            avcodec_free_context(context);
            throw e;
        }
        AVRational tb = stream.time_base();
        timeBase = (double) tb.num() / tb.den();
        AVRational rate = stream.avg_frame_rate();
        nominalFrameSeconds = rate.num() > 0 && rate.den() > 0 ? (double) rate.den() / rate.num() : Double.NaN;
    }

    /** True when the stream is raw video (clips must then be encoded, not copied). */
    boolean raw() {
        return stream.codecpar().codec_id() == org.bytedeco.ffmpeg.global.avcodec.AV_CODEC_ID_RAWVIDEO;
    }

    @Override
    public void close() {
        avcodec_free_context(context);
    }

    private static void check(int ret, String what) {
        if (ret < 0) {
            throw new IllegalStateException(what + " failed (FFmpeg error " + ret + ")");
        }
    }
}
