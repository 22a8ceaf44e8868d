package wayward.capture;

import static org.bytedeco.ffmpeg.global.avcodec.AV_PKT_FLAG_KEY;
import static org.bytedeco.ffmpeg.global.avcodec.av_packet_unref;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_alloc_context3;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_find_decoder;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_free_context;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_open2;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_parameters_to_context;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_receive_frame;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_send_packet;
import static org.bytedeco.ffmpeg.global.avformat.av_find_best_stream;
import static org.bytedeco.ffmpeg.global.avutil.AVMEDIA_TYPE_VIDEO;
import static org.bytedeco.ffmpeg.global.avutil.AV_LOG_ERROR;
import static org.bytedeco.ffmpeg.global.avutil.AV_NOPTS_VALUE;
import static org.bytedeco.ffmpeg.global.avutil.av_frame_alloc;
import static org.bytedeco.ffmpeg.global.avutil.av_frame_free;
import static org.bytedeco.ffmpeg.global.avutil.av_log_set_level;

import org.bytedeco.ffmpeg.avcodec.AVCodec;
import org.bytedeco.ffmpeg.avcodec.AVCodecContext;
import org.bytedeco.ffmpeg.avcodec.AVPacket;
import org.bytedeco.ffmpeg.avformat.AVFormatContext;
import org.bytedeco.ffmpeg.avformat.AVStream;
import org.bytedeco.ffmpeg.avutil.AVDictionary;
import org.bytedeco.ffmpeg.avutil.AVFrame;
import org.bytedeco.ffmpeg.avutil.AVRational;
import org.bytedeco.javacpp.IntPointer;
import org.bytedeco.javacpp.PointerPointer;
import org.bytedeco.javacv.FFmpegFrameGrabber;
import org.bytedeco.javacv.FFmpegLogCallback;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.image.GrayFrame;
import wayward.retry.Backoff;
import wayward.secret.Urls;

/**
 * Reads one camera: demuxes with JavaCV's {@link FFmpegFrameGrabber#grabPacket()} (the only reader of the
 * stream), decodes with a decoder of its own, shrinks the picture's luma plane straight to analysis size with
 * swscale's area filter and publishes it to a {@link FrameSlot}. Frames are timed by the stream's timestamps
 * (seconds since the first frame, continued across loops and reconnects). URL sources reconnect with
 * exponential backoff and jitter, forever, until stopped.
 *
 * <p>Runs on the camera's capture thread ({@link #run()}); {@link #stop()} may be called from any thread. The
 * capture thread never waits for analysis (except in lossless replay), the network or the disk.
 */
public final class VideoSource implements Runnable {
    /**
     * Told when a network source stops delivering frames and when it delivers again; called on the capture
     * thread, so it must not block.
     */
    public interface Health {
        /** Frames stopped: the stream ended, failed or stalled. {@code streamSeconds} of the last frame. */
        void lost(String reason, double streamSeconds);

        /** Frames arrive again after {@link #lost}. */
        void back(double streamSeconds);
    }

    /** No decoded frame for this long while connected counts as a stall: the connection is dropped. */
    private static final long STALL_NANOS = 10_000_000_000L;
    /** First wait before a live source is opened again, milliseconds; it doubles per failure up to the next. */
    static final long RECONNECT_FIRST_MILLIS = 500;
    static final long RECONNECT_MAX_MILLIS = 30_000;

    private static final Logger LOG = LoggerFactory.getLogger(VideoSource.class);
    /** Socket timeout for network sources, microseconds (FFmpeg's option "timeout"). */
    private static final String NETWORK_TIMEOUT_MICROS = "5000000";

    static {
        // FFmpeg's own chatter goes through SLF4J at error level only.
        av_log_set_level(AV_LOG_ERROR);
        FFmpegLogCallback.set();
    }

    private final String cameraId;
    private final SourceOptions options;
    private final FrameSlot slot;
    private final Health health;
    private final ClipRecorder clips;
    private volatile boolean lost;
    private volatile boolean connectedOnce;
    private volatile long reconnects;
    /** Stream time from which stage CPU is counted (bench); NaN: not measured. */
    private volatile double measureFrom = Double.NaN;
    /** Capture thread: counting has begun (the first frame at or after measureFrom was decoded). */
    private boolean measure;
    private volatile long decodeCpu;
    private volatile long downscaleCpu;
    private volatile long decodedBeforeMeasuring = -1;
    private static final java.lang.management.ThreadMXBean THREADS = java.lang.management.ManagementFactory.getThreadMXBean();

    /** The calling thread's CPU time, nanoseconds (stage measurements of bench). */
    public static long cpu() {
        return THREADS.getCurrentThreadCpuTime();
    }

    /**
     * Before the run: measure the CPU time of decoding and of gray conversion plus downscaling from stream time
     * {@code fromSeconds} on (bench; the seconds before it are JIT warm-up).
     */
    public void measureStages(double fromSeconds) {
        measureFrom = fromSeconds;
    }

    /** Frames decoded since counting began, or 0 before it. */
    public long framesMeasured() {
        long before = decodedBeforeMeasuring;
        return before < 0 ? 0 : frameIndex - before;
    }

    /** CPU nanoseconds spent decoding (send and receive), when measured. */
    public long decodeCpuNanos() {
        return decodeCpu;
    }

    /** CPU nanoseconds spent taking the luma plane and downscaling it, when measured. */
    public long downscaleCpuNanos() {
        return downscaleCpu;
    }
    private long lastFrameNanos;
    private volatile boolean stopping;
    private volatile String fileFailure;
    private final boolean live;
    private volatile Thread runner;

    // stream-time bookkeeping, capture thread only
    private final StreamClock clock;
    private double nextDue;
    private volatile long frameIndex;
    private long wallStartNanos;
    private double wallStartStream;
    private volatile long decodeErrors;

    // buffers, capture thread only
    /** Analysis size, fixed by the first frame (0 before it). */
    private final Shrink shrink;

    /** @param clips the camera's clip recorder, or null for no clips (replay) */
    public VideoSource(String cameraId, SourceOptions options, FrameSlot slot, Health health, ClipRecorder clips) {
        this.clips = clips;
        this.live = Sources.isLive(options.source());
        this.clock = new StreamClock(live, System::nanoTime);
        this.shrink = new Shrink(options.analysisWidth());
        this.cameraId = cameraId;
        this.options = options;
        this.slot = slot;
        this.health = health;
    }

    /** Asks the capture loop to end; it closes the slot on its way out. Any thread. */
    public void stop() {
        stopping = true;
        Thread t = runner;
        if (t != null) {
            t.interrupt();
        }
    }

    public long decodeErrors() {
        return decodeErrors;
    }

    /** Pictures decoded so far (all passes and connections). Any thread. */
    public long framesIn() {
        return frameIndex;
    }

    /** Reconnect attempts of a live source so far. Any thread. */
    public long reconnects() {
        return reconnects;
    }

    /** True while frames arrive: connected once and not lost since. Any thread. */
    public boolean delivering() {
        return connectedOnce && !lost;
    }

    /** For a file that gave no frame at all: why (FFmpeg's reason); otherwise null. */
    public String fileFailure() {
        return fileFailure;
    }

    @Override
    public void run() {
        runner = Thread.currentThread();
        boolean url = Sources.isLive(options.source());
        String shown = Urls.mask(options.source());
        int passes = 0;
        Backoff backoff = new Backoff(RECONNECT_FIRST_MILLIS, RECONNECT_MAX_MILLIS);
        try {
            while (!stopping) {
                long framesBefore = frameIndex;
                String failure = null;
                try {
                    readOnce();
                } catch (InterruptedException e) {
                    break;
                } catch (Exception e) {
                    // FFmpeg's messages quote the address, password included
                    failure = e.getMessage() == null ? e.getClass().getSimpleName() : Urls.maskIn(e.getMessage());
                }
                if (stopping) {
                    break;
                }
                boolean gotFrames = frameIndex > framesBefore;
                if (!url) {
                    if (failure != null) {
                        LOG.error("camera {}: cannot read {}: {}", cameraId, shown, failure);
                        if (!gotFrames) {
                            fileFailure = failure;
                            break;
                        }
                    }
                    passes++;
                    if (!options.loop() || (options.maxLoops() > 0 && passes >= options.maxLoops())) {
                        LOG.info("camera {}: end of {} after {} frames", cameraId, shown, frameIndex);
                        break;
                    }
                    clock.nextPass();
                    continue;
                }
                if (gotFrames) {
                    backoff.reset();
                }
                if (!lost) {
                    lost = true;
                    health.lost(failure != null ? failure : (connectedOnce ? "stream ended" : "no frames"),
                            Math.max(0, clock.lastSeconds()));
                }
                long wait = backoff.nextMillis();
                LOG.warn("camera {}: stream {} {}; reconnecting in {} ms", cameraId, shown,
                        failure != null ? "failed (" + failure + ")" : "ended", wait);
                Thread.sleep(wait);
                reconnects++;
                clock.nextPass();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } finally {
            if (clips != null) {
                clips.close();
            }
            slot.close();
            runner = null;
        }
    }

    /** One open–read–close pass over the source. */
    private void readOnce() throws Exception {
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
            grabber.setOption("timeout", NETWORK_TIMEOUT_MICROS);
            grabber.setOption("analyzeduration", "500000");
        }
        AVCodecContext decoder = null;
        AVFrame frame = null;
        try {
            grabber.start();
            AVFormatContext fmt = grabber.getFormatContext();
            String formatName = fmt.iformat() != null && fmt.iformat().name() != null
                    ? fmt.iformat().name().getString() : "";
            // multipart JPEG: FFmpeg makes the timestamps up at an assumed rate
            boolean untimedContainer = formatName.equals("mpjpeg") || formatName.equals("mjpeg");
            int videoIndex = av_find_best_stream(fmt, AVMEDIA_TYPE_VIDEO, -1, -1, (AVCodec) null, 0);
            if (videoIndex < 0) {
                throw new IllegalStateException("no video stream");
            }
            AVStream stream = fmt.streams(videoIndex);
            AVCodec codec = avcodec_find_decoder(stream.codecpar().codec_id());
            if (codec == null) {
                throw new IllegalStateException("no decoder for codec id " + stream.codecpar().codec_id());
            }
            decoder = avcodec_alloc_context3(codec);
            check(avcodec_parameters_to_context(decoder, stream.codecpar()), "copy codec parameters");
            decoder.thread_count(1);
            decoder.pkt_timebase(stream.time_base());
            // skip the deblocking filter (10–20 % of H.264 decode time here): it smooths block edges, which the
            // shrink to analysis size averages out anyway; only analysis sees these pictures (clips are copies)
            decoder.skip_loop_filter(org.bytedeco.ffmpeg.global.avcodec.AVDISCARD_ALL);
            check(avcodec_open2(decoder, codec, (AVDictionary) null), "open decoder");
            AVRational tb = stream.time_base();
            double timeBase = (double) tb.num() / tb.den();
            AVRational rate = stream.avg_frame_rate();
            clock.opened(untimedContainer, rate.num() > 0 && rate.den() > 0 ? (double) rate.den() / rate.num()
                    : Double.NaN);
            if (clips != null) {
                if (stream.codecpar().codec_id() == org.bytedeco.ffmpeg.global.avcodec.AV_CODEC_ID_RAWVIDEO) {
                    LOG.info("camera {}: raw video; clips are encoded with libopenh264 (device_format = \"mjpeg\""
                            + " costs less CPU)", cameraId);
                }
                clips.onStream(stream.codecpar(), stream.time_base(), 1.0 / clock.nominalFrameSeconds());
            }
            frame = av_frame_alloc();
            // views of the frame's own plane and stride arrays, valid while it lives: no wrapper per picture
            framePlanes = frame.data();
            frameStrides = frame.linesize();
            boolean keySeen = false;
            lastFrameNanos = System.nanoTime();
            boolean network = Sources.isLive(options.source());
            wallStartNanos = System.nanoTime();
            wallStartStream = Double.NaN;
            while (!stopping) {
                AVPacket pkt = grabber.grabPacket();
                if (pkt == null) {
                    break;
                }
                if (network && System.nanoTime() - lastFrameNanos > STALL_NANOS) {
                    // packets but no pictures (other streams only, or undecodable): start over
                    av_packet_unref(pkt);
                    throw new IllegalStateException("no picture for " + STALL_NANOS / 1_000_000_000L + " s");
                }
                try {
                    if (pkt.stream_index() != videoIndex) {
                        continue;
                    }
                    // joining mid-GOP: the decoder cannot use packets before the first keyframe
                    if (!keySeen) {
                        if ((pkt.flags() & AV_PKT_FLAG_KEY) == 0) {
                            continue;
                        }
                        keySeen = true;
                    }
                    double pktSeconds = clock.packetSeconds(pkt.pts() != AV_NOPTS_VALUE ? pkt.pts() : pkt.dts(),
                            timeBase);
                    if (clips != null) {
                        clips.onPacket(pkt, pktSeconds);
                    }
                    long c0 = measure ? cpu() : 0;
                    int sent = avcodec_send_packet(decoder, pkt);
                    if (measure) {
                        decodeCpu += cpu() - c0;
                    }
                    if (sent < 0) {
                        decodeErrors++;
                        continue;
                    }
                } finally {
                    av_packet_unref(pkt);
                }
                drain(decoder, frame, timeBase);
            }
            if (!stopping) {
                avcodec_send_packet(decoder, (AVPacket) null);
                drain(decoder, frame, timeBase);
            }
        } finally {
            shrink.endPass();
            if (frame != null) {
                av_frame_free(frame);
            }
            if (decoder != null) {
                avcodec_free_context(decoder);
            }
            try {
                grabber.close();
            } catch (Exception e) {
                LOG.debug("camera {}: close failed: {}", cameraId, e.toString());
            }
        }
    }

    private void drain(AVCodecContext decoder, AVFrame frame, double timeBase) throws InterruptedException {
        while (true) {
            long c0 = measure ? cpu() : 0;
            int got = avcodec_receive_frame(decoder, frame);
            if (measure) {
                decodeCpu += cpu() - c0;
            }
            if (got != 0) {
                return;
            }
            onFrame(frame, timeBase);
        }
    }

    private void onFrame(AVFrame f, double timeBase) throws InterruptedException {
        long ts = f.best_effort_timestamp();
        if (ts == AV_NOPTS_VALUE) {
            ts = f.pts();
        }
        double t = clock.frameSeconds(ts, timeBase);
        if (!measure && t >= measureFrom) {
            measure = true; // from this frame on (its decode was just before: the count starts with the next)
            decodedBeforeMeasuring = frameIndex + 1;
        }
        long index = frameIndex++;
        lastFrameNanos = System.nanoTime();
        connectedOnce = true;
        if (lost) {
            lost = false;
            health.back(t);
        }
        if (options.realtime() && !live) {
            // a file played as a camera; a live source is paced by the camera itself
            pace(t);
        }
        double interval = 1.0 / options.analysisFps();
        if (t + 1e-6 < nextDue) {
            return;
        }
        nextDue = Math.max(nextDue + interval, t + interval * 0.5);
        int w = f.width();
        int h = f.height();
        if (w < 2 || h < 2) {
            decodeErrors++;
            return;
        }
        long c0 = measure ? cpu() : 0;
        GrayFrame out = shrink.into(f, framePlanes, frameStrides, slot);
        if (measure) {
            downscaleCpu += cpu() - c0;
        }
        out.streamSeconds = t;
        out.frameIndex = index;
        slot.publish();
    }

    /** The decoded frame's plane pointers and line sizes (views into the AVFrame of the current pass). */
    private PointerPointer<?> framePlanes;
    private IntPointer frameStrides;

    /** Sleeps so that stream time advances no faster than wall time (a file played as a camera). */
    private void pace(double t) throws InterruptedException {
        if (Double.isNaN(wallStartStream)) {
            wallStartStream = t;
            wallStartNanos = System.nanoTime();
            return;
        }
        long dueNanos = wallStartNanos + (long) ((t - wallStartStream) * 1e9);
        long waitNanos = dueNanos - System.nanoTime();
        if (waitNanos > 1_000_000) {
            Thread.sleep(waitNanos / 1_000_000, (int) (waitNanos % 1_000_000));
        }
    }


    private static void check(int ret, String what) {
        if (ret < 0) {
            throw new IllegalStateException(what + " failed (FFmpeg error " + ret + ")");
        }
    }
}
