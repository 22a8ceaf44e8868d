package wayward.capture;

import static org.bytedeco.ffmpeg.global.avcodec.AV_PKT_FLAG_KEY;
import static org.bytedeco.ffmpeg.global.avcodec.av_packet_unref;
import static org.bytedeco.ffmpeg.global.avformat.av_find_best_stream;
import static org.bytedeco.ffmpeg.global.avutil.AVMEDIA_TYPE_VIDEO;
import static org.bytedeco.ffmpeg.global.avutil.AV_NOPTS_VALUE;

import org.bytedeco.ffmpeg.avcodec.AVCodec;
import org.bytedeco.ffmpeg.avcodec.AVPacket;
import org.bytedeco.ffmpeg.avformat.AVFormatContext;
import org.bytedeco.ffmpeg.avformat.AVStream;
import org.bytedeco.ffmpeg.avutil.AVRational;
import org.bytedeco.javacv.FFmpegFrameGrabber;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.retry.Backoff;
import wayward.secret.Urls;

/**
 * Reads a two-stream camera's main stream ({@code source}) without decoding it: demuxes with JavaCV's
 * {@link FFmpegFrameGrabber#grabPacket()}, puts each video packet on the analysis stream's time axis through the
 * camera's {@link StreamLink} and hands it to the main stream's {@link ClipRecorder} (pre-roll ring and clips at
 * full size). No decoder of ours is ever opened for it ({@link #framesDecoded()} stays 0 by construction; the
 * grabber's own, opened by {@code start}, is kept to one thread and never fed). Reconnects on its own with the
 * same backoff as {@link VideoSource}, and reports its health apart from the analysis stream's.
 *
 * <p>Runs on the camera's second capture thread ({@link #run()}, named {@code demux-<camera>});
 * {@link #stop()} and the getters from any thread. It never waits for analysis, the network (beyond FFmpeg's
 * socket timeout) or the disk.
 */
public final class MainStreamReader implements Runnable {
    /** A pair of files: how often the main file looks whether its analysis file has begun, milliseconds. */
    private static final long WAIT_FOR_ANALYSIS_MILLIS = 5;
    /** No packet for this long while connected counts as a stall: the connection is dropped. */
    private static final long STALL_NANOS = 10_000_000_000L;

    private static final Logger LOG = LoggerFactory.getLogger(MainStreamReader.class);

    private final String cameraId;
    private final SourceOptions options;
    private final VideoSource.Health health;
    private final ClipRecorder clips;
    private final StreamLink link;
    private final boolean url;
    private volatile boolean stopping;
    private volatile Thread runner;
    private volatile boolean lost;
    private volatile boolean connectedOnce;
    private volatile long reconnects;
    private volatile long packetsIn;
    private volatile int width;
    private volatile int height;
    /** CPU time of demuxing and handing packets over, counted from a main stream time on (bench). */
    private volatile double measureFromSeconds = Double.NaN;
    private volatile long demuxCpuNanos;
    private volatile long packetsMeasured;
    private volatile double secondsMeasured;
    /** The newest packet's time on the analysis axis minus its own main stream time, seconds (NaN before). */
    private volatile double shiftSeconds = Double.NaN;

    // capture thread only
    /** Main stream seconds at the start of this pass (continued across passes and reconnects). */
    private double passOffsetSeconds;
    private double lastSeconds = -1;
    private double frameSeconds = 1.0 / 25;
    private long lastPacketNanos;
    private long seenAnalysisPass = -1;

    /**
     * @param options how the main stream is opened ({@code source}); its realtime flag paces a file
     * @param health  told when the main stream is lost and back (capture thread; must not block)
     * @param clips   the main stream's recorder, or null (bench: demux only)
     * @param link    the camera's time link to its analysis stream
     */
    public MainStreamReader(String cameraId, SourceOptions options, VideoSource.Health health, ClipRecorder clips,
            StreamLink link) {
        this.cameraId = cameraId;
        this.options = options;
        this.health = health;
        this.clips = clips;
        this.link = link;
        this.url = Sources.isLive(options.source());
    }

    /** Asks the loop to end; it closes the recorder on its way out. Any thread. */
    public void stop() {
        stopping = true;
        Thread t = runner;
        if (t != null) {
            t.interrupt();
        }
    }

    /** Video packets read so far, all passes. Any thread. */
    public long packetsIn() {
        return packetsIn;
    }

    /** Pictures decoded from the main stream: always 0, it is only demuxed (the status shows it). Any thread. */
    public long framesDecoded() {
        return 0;
    }

    /** Reconnect attempts so far. Any thread. */
    public long reconnects() {
        return reconnects;
    }

    /** True while packets arrive: connected once and not lost since. Any thread. */
    public boolean watching() {
        return connectedOnce && !lost;
    }

    /** The main stream's picture width from its codec parameters, pixels; 0 before it opened. Any thread. */
    public int width() {
        return width;
    }

    /** The main stream's picture height, pixels; 0 before it opened. Any thread. */
    public int height() {
        return height;
    }

    /**
     * The newest packet's time on the analysis stream's axis minus its own stream time, seconds; NaN before the
     * first placed packet or without clips. For two files of one recording started together it should be 0: the
     * difference is the mapping's error. Any thread.
     */
    public double shiftSeconds() {
        return shiftSeconds;
    }

    /** Before {@link #run}: count the demux CPU from main stream time {@code fromSeconds} on (bench). */
    public void measureFrom(double fromSeconds) {
        measureFromSeconds = fromSeconds;
    }

    /** CPU nanoseconds of demuxing and handing packets over since counting began. Any thread. */
    public long demuxCpuNanos() {
        return demuxCpuNanos;
    }

    /** Packets counted in {@link #demuxCpuNanos}. */
    public long packetsMeasured() {
        return packetsMeasured;
    }

    /** Main stream seconds covered by the count. */
    public double secondsMeasured() {
        return secondsMeasured;
    }

    @Override
    public void run() {
        runner = Thread.currentThread();
        String shown = Urls.mask(options.source());
        int passes = 0;
        Backoff backoff = new Backoff(VideoSource.RECONNECT_FIRST_MILLIS, VideoSource.RECONNECT_MAX_MILLIS);
        try {
            while (!stopping) {
                long before = packetsIn;
                String failure = null;
                try {
                    readOnce();
                } catch (InterruptedException e) {
                    break;
                } catch (Exception e) {
                    failure = e.getMessage() == null ? e.getClass().getSimpleName() : Urls.maskIn(e.getMessage());
                }
                if (stopping) {
                    break;
                }
                boolean gotPackets = packetsIn > before;
                passOffsetSeconds = lastSeconds < 0 ? 0 : lastSeconds + frameSeconds; // continued, as StreamClock
                if (!url) {
                    if (failure != null) {
                        LOG.error("camera {}: cannot read source {}: {}", cameraId, shown, failure);
                        if (!gotPackets) {
                            break;
                        }
                    }
                    passes++;
                    if (!options.loop() || (options.maxLoops() > 0 && passes >= options.maxLoops())) {
                        LOG.info("camera {}: end of source {} after {} packets", cameraId, shown, packetsIn);
                        break;
                    }
                    continue;
                }
                if (gotPackets) {
                    backoff.reset();
                }
                if (!lost) {
                    lost = true;
                    health.lost(failure != null ? failure : (connectedOnce ? "stream ended" : "no packets"),
                            Math.max(0, lastSeconds));
                }
                long wait = backoff.nextMillis();
                LOG.warn("camera {}: source {} {}; reconnecting in {} ms", cameraId, shown,
                        failure != null ? "failed (" + failure + ")" : "ended", wait);
                Thread.sleep(wait);
                reconnects++;
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } finally {
            if (clips != null) {
                clips.close();
            }
            runner = null;
        }
    }

    /** One open–read–close pass over the main stream. */
    private void readOnce() throws Exception {
        FFmpegFrameGrabber grabber = VideoDecoder.grabber(options);
        try {
            // not start(): see VideoSource (one JVM-wide lock for the whole open)
            grabber.startUnsafe();
            AVFormatContext fmt = grabber.getFormatContext();
            int videoIndex = av_find_best_stream(fmt, AVMEDIA_TYPE_VIDEO, -1, -1, (AVCodec) null, 0);
            if (videoIndex < 0) {
                throw new IllegalStateException("no video stream");
            }
            AVStream stream = fmt.streams(videoIndex);
            AVRational tb = stream.time_base();
            final double timeBase = (double) tb.num() / tb.den();
            AVRational rate = stream.avg_frame_rate();
            if (rate.num() > 0 && rate.den() > 0) {
                frameSeconds = (double) rate.den() / rate.num();
            }
            width = stream.codecpar().width();
            height = stream.codecpar().height();
            link.mainOpened();
            seenAnalysisPass = link.analysisPass();
            if (clips != null) {
                clips.onStream(stream.codecpar(), tb, 1.0 / frameSeconds);
            }
            boolean keySeen = false;
            double first = Double.NaN;
            boolean paced = options.realtime() && !url;
            lastPacketNanos = System.nanoTime();
            while (!stopping) {
                long c0 = CaptureMeter.cpu();
                AVPacket pkt = grabber.grabPacket();
                if (pkt == null) {
                    break;
                }
                long now = System.nanoTime();
                if (url && now - lastPacketNanos > STALL_NANOS) {
                    av_packet_unref(pkt);
                    throw new IllegalStateException("no video packet for " + STALL_NANOS / 1_000_000_000L + " s");
                }
                try {
                    if (pkt.stream_index() != videoIndex) {
                        continue;
                    }
                    if (!keySeen) {
                        if ((pkt.flags() & AV_PKT_FLAG_KEY) == 0) {
                            continue;
                        }
                        keySeen = true;
                    }
                    long ts = pkt.dts() != AV_NOPTS_VALUE ? pkt.dts() : pkt.pts();
                    long pts = pkt.pts() != AV_NOPTS_VALUE ? pkt.pts() : pkt.dts();
                    if (ts == AV_NOPTS_VALUE) {
                        continue; // an untimed packet cannot be placed on the analysis axis
                    }
                    if (Double.isNaN(first)) {
                        first = pts * timeBase; // the first keyframe's presentation: time 0, as in StreamClock
                    }
                    double seconds = pts * timeBase - first + passOffsetSeconds;
                    if (paced) {
                        // a file played as a camera, in step with its analysis file (StreamLink): a packet is due
                        // when the analysis stream reaches its decoding time (before its presentation)
                        double dueSeconds = ts * timeBase - first + passOffsetSeconds;
                        long due;
                        while ((due = link.analysisNanosAt(dueSeconds)) == Long.MIN_VALUE && !stopping
                                && !link.analysisHasEnded()) {
                            Thread.sleep(WAIT_FOR_ANALYSIS_MILLIS); // the analysis file is still opening
                        }
                        // (an analysis file that has ended for good paces nothing more: the rest goes at once)
                        long wait = due == Long.MIN_VALUE ? 0 : due - System.nanoTime();
                        if (wait > 1_000_000) {
                            Thread.sleep(wait / 1_000_000, (int) (wait % 1_000_000));
                        }
                        now = System.nanoTime();
                    }
                    lastPacketNanos = now;
                    lastSeconds = Math.max(lastSeconds, seconds);
                    packetsIn++;
                    connectedOnce = true;
                    if (lost) {
                        lost = false;
                        health.back(Math.max(0, lastSeconds));
                    }
                    if (clips != null) {
                        long pass = link.analysisPass();
                        if (url && pass != seenAnalysisPass) {
                            // the analysis stream reopened and its time axis was spliced: what the ring holds was
                            // placed on the old axis, so the ring starts again (clips open now are ended)
                            seenAnalysisPass = pass;
                            clips.onStream(stream.codecpar(), tb, 1.0 / frameSeconds);
                        }
                        // the arrival-based placement; for a pair of files it measures how well they keep step
                        double onAnalysis = link.mainToAnalysis(now, seconds);
                        if (!Double.isNaN(onAnalysis)) {
                            shiftSeconds = onAnalysis - seconds;
                        }
                        if (!url) {
                            onAnalysis = seconds; // files cut together: one time axis (StreamLink)
                        }
                        if (!Double.isNaN(onAnalysis)) {
                            clips.onPacket(pkt, onAnalysis);
                        }
                    }
                    double from = measureFromSeconds;
                    if (!Double.isNaN(from) && seconds >= from) {
                        demuxCpuNanos += CaptureMeter.cpu() - c0;
                        packetsMeasured++;
                        secondsMeasured = seconds - from;
                    }
                } finally {
                    av_packet_unref(pkt);
                }
            }
        } finally {
            try {
                grabber.close();
            } catch (Exception e) {
                LOG.debug("camera {}: close of source failed: {}", cameraId, e.toString());
            }
        }
    }
}
