package wayward.capture;

import static org.bytedeco.ffmpeg.global.avcodec.AV_PKT_FLAG_KEY;
import static org.bytedeco.ffmpeg.global.avcodec.av_packet_clone;
import static org.bytedeco.ffmpeg.global.avcodec.av_packet_free;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_parameters_alloc;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_parameters_copy;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_parameters_free;

import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.concurrent.atomic.AtomicInteger;
import org.bytedeco.ffmpeg.avcodec.AVCodecParameters;
import org.bytedeco.ffmpeg.avcodec.AVPacket;
import org.bytedeco.ffmpeg.avutil.AVRational;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.clip.ClipWriter;

/**
 * Keeps the camera's compressed video packets since the keyframe before the pre-roll window (the pre-roll
 * ring), and on request turns them, plus what follows until the post-roll has passed, into an evidence clip by
 * stream copy. Requests come from the analysis thread ({@link #start}, {@link #finish}); everything else runs
 * on the capture thread, which only clones packet references and hands them to a writer thread per clip: it
 * never waits for the disk (a clip whose writer falls behind by {@value #QUEUE_PACKETS} packets is cut short).
 */
public final class ClipRecorder {
    private static final Logger LOG = LoggerFactory.getLogger(ClipRecorder.class);
    private static final int QUEUE_PACKETS = 20_000;
    /** About 20 s of 15 fps raw video: at 640×480 YUYV some 180 MB at worst. */
    private static final int RAW_QUEUE_PACKETS = 300;
    private static final int MAX_RING_PACKETS = 5_000;
    private static final int MAX_OPEN_CLIPS = 8;

    private final String cameraId;
    private final double preRollSeconds;
    private final double postRollSeconds;
    private final double maxSeconds;
    private final ConcurrentLinkedQueue<Object> commands = new ConcurrentLinkedQueue<>();
    private final AtomicInteger open = new AtomicInteger();
    private final List<Thread> writers = new ArrayList<>();

    /** The ring starts at a keyframe: true while it holds one (written by the capture thread, read by analysis). */
    private volatile boolean keyframeHeld;

    // capture thread only
    private final ArrayDeque<Entry> ring = new ArrayDeque<>();
    private final List<Job> jobs = new ArrayList<>();
    private AVCodecParameters parameters;
    private AVRational timeBase;
    private double framesPerSecond = 15;
    /** Raw video: each packet is a whole picture, so a writer's queue is kept short (memory). */
    private int queuePackets = QUEUE_PACKETS;

    private record Entry(AVPacket packet, double seconds, boolean key) {
    }

    private record Start(String eventId, double triggerSeconds, Path file) {
    }

    private record Finish(String eventId, double endSeconds) {
    }

    private static final class Job {
        final String eventId;
        final Path file;
        final double startSeconds;
        /** Which part of the event's clip this is (1 = the file the event names). */
        int part = 1;
        final ArrayBlockingQueue<AVPacket> queue;
        volatile boolean done;
        double endDue = Double.POSITIVE_INFINITY;

        Job(String eventId, Path file, double startSeconds, int capacity) {
            this.queue = new ArrayBlockingQueue<>(capacity);
            this.eventId = eventId;
            this.file = file;
            this.startSeconds = startSeconds;
        }
    }

    public ClipRecorder(String cameraId, double preRollSeconds, double postRollSeconds, double maxSeconds) {
        this.cameraId = cameraId;
        this.preRollSeconds = preRollSeconds;
        this.postRollSeconds = postRollSeconds;
        this.maxSeconds = maxSeconds;
    }

    /** True while the pre-roll ring holds a keyframe, so a clip can begin. Any thread. */
    public boolean hasKeyframe() {
        return keyframeHeld;
    }

    /** Analysis thread: begin a clip for an event that started at {@code triggerSeconds} (stream time). */
    public void start(String eventId, double triggerSeconds, Path file) {
        commands.add(new Start(eventId, triggerSeconds, file));
    }

    /** Analysis thread: the event ended; the clip goes on for the post-roll, then closes. */
    public void finish(String eventId, double endSeconds) {
        commands.add(new Finish(eventId, endSeconds));
    }

    /** Capture thread: a (new) video stream was opened; earlier packets' timestamps no longer apply. */
    void onStream(AVCodecParameters codecParameters, AVRational streamTimeBase, double streamFramesPerSecond) {
        framesPerSecond = streamFramesPerSecond;
        queuePackets = codecParameters.codec_id() == org.bytedeco.ffmpeg.global.avcodec.AV_CODEC_ID_RAWVIDEO
                ? RAW_QUEUE_PACKETS : QUEUE_PACKETS;
        endAll("the stream was reopened");
        clearRing();
        if (parameters == null) {
            parameters = avcodec_parameters_alloc();
        }
        avcodec_parameters_copy(parameters, codecParameters);
        timeBase = new AVRational().num(streamTimeBase.num()).den(streamTimeBase.den());
    }

    /** Capture thread: one video packet (not kept; cloned where needed) at stream time {@code seconds}. */
    void onPacket(AVPacket packet, double seconds) {
        if (parameters == null) {
            return;
        }
        boolean key = (packet.flags() & AV_PKT_FLAG_KEY) != 0;
        if (ring.isEmpty() && !key) {
            return; // the ring starts at a keyframe
        }
        AVPacket clone = av_packet_clone(packet);
        if (clone.pts() == org.bytedeco.ffmpeg.global.avutil.AV_NOPTS_VALUE
                && clone.dts() == org.bytedeco.ffmpeg.global.avutil.AV_NOPTS_VALUE) {
            // an untimed source (MJPEG over HTTP): the clip takes the stream clock
            long ts = Math.round(seconds * timeBase.den() / (double) timeBase.num());
            clone.pts(ts);
            clone.dts(ts);
        }
        ring.addLast(new Entry(clone, seconds, key));
        keyframeHeld = true;
        trim(seconds);
        // existing clips first, so a clip begun by this packet does not get it twice
        List<Job> continued = null;
        for (Iterator<Job> it = jobs.iterator(); it.hasNext();) {
            Job j = it.next();
            if (j.done) {
                it.remove();
                continue;
            }
            if (seconds > j.endDue) {
                j.queue.offer(ClipWriter.END);
                it.remove();
                continue;
            }
            if (key && seconds - j.startSeconds >= maxSeconds) {
                // a long event: this part closes at the keyframe, the next part starts with it
                j.queue.offer(ClipWriter.END);
                it.remove();
                Job next = startWriter(j.eventId, partFile(j.file, j.part + 1), seconds);
                if (next != null) {
                    next.part = j.part + 1;
                    next.endDue = j.endDue;
                    LOG.info("camera {}: clip of event {} goes on in {}", cameraId, j.eventId, next.file.getFileName());
                    if (continued == null) {
                        continued = new ArrayList<>();
                    }
                    continued.add(next);
                }
                continue;
            }
            if (j.startSeconds <= seconds && !handOver(j, ring.peekLast().packet())) {
                it.remove();
            }
        }
        if (continued != null) {
            for (Job j : continued) {
                if (handOver(j, ring.peekLast().packet())) {
                    jobs.add(j);
                }
            }
        }
        Object c;
        while ((c = commands.poll()) != null) {
            if (c instanceof Start) {
                begin((Start) c);
            } else {
                Finish f = (Finish) c;
                for (Job j : jobs) {
                    if (j.eventId.equals(f.eventId())) {
                        j.endDue = f.endSeconds() + postRollSeconds;
                    }
                }
            }
        }
    }

    /** Capture thread: the source is closing for good; every open clip is ended, the ring freed. */
    void close() {
        endAll(null);
        clearRing();
        if (parameters != null) {
            avcodec_parameters_free(parameters);
            parameters = null;
        }
    }

    /** Waits for the clip writers to finish their files (shutdown), at most the given time in total. */
    public void awaitWriters(long timeoutMillis) throws InterruptedException {
        long deadline = System.currentTimeMillis() + timeoutMillis;
        List<Thread> copy;
        synchronized (writers) {
            copy = new ArrayList<>(writers);
        }
        for (Thread t : copy) {
            t.join(Math.max(1, deadline - System.currentTimeMillis()));
        }
    }

    @SuppressWarnings("ReferenceEquality") // ring entries are compared by identity, not by content
    private void begin(Start s) {
        // from the keyframe at or before trigger − pre-roll (or the oldest keyframe the ring holds)
        double from = s.triggerSeconds() - preRollSeconds;
        Entry first = null;
        for (Entry e : ring) {
            if (e.key() && (first == null || e.seconds() <= from)) {
                first = e;
            }
        }
        if (first == null) {
            return;
        }
        Job j = startWriter(s.eventId(), s.file(), first.seconds());
        if (j == null) {
            return;
        }
        boolean copying = false;
        for (Entry e : ring) {
            copying |= e == first;
            if (copying && !handOver(j, e.packet())) {
                return;
            }
        }
        jobs.add(j);
    }

    /** A job and its writer thread, waiting for packets; null when too many clips are open. */
    private Job startWriter(String eventId, Path file, double startSeconds) {
        if (open.get() >= MAX_OPEN_CLIPS) {
            LOG.error("camera {}: {} clips already being written; no clip {}", cameraId, MAX_OPEN_CLIPS,
                    file.getFileName());
            return null;
        }
        Job j = new Job(eventId, file, startSeconds, queuePackets);
        open.incrementAndGet();
        Thread t = new Thread(new ClipWriter(file, parameters, timeBase, framesPerSecond, j.queue, () -> {
            j.done = true;
            open.decrementAndGet();
        }), "clip-" + cameraId);
        synchronized (writers) {
            writers.removeIf(w -> !w.isAlive());
            writers.add(t);
        }
        t.start();
        return j;
    }

    /** clip.mp4 → clip-part2.mp4 (for part 2 and on). */
    static Path partFile(Path first, int part) {
        String name = first.getFileName().toString();
        String base = name.replaceAll("(-part\\d+)?\\.mp4$", "");
        return first.resolveSibling(base + "-part" + part + ".mp4");
    }

    /** Hands a clone to the job's writer; false (and the clip cut short) when the writer is too far behind. */
    private boolean handOver(Job j, AVPacket packet) {
        AVPacket clone = av_packet_clone(packet);
        if (!j.queue.offer(clone)) {
            av_packet_free(clone);
            LOG.error("camera {}: clip {} cannot keep up with the stream; cut short", cameraId, j.file.getFileName());
            j.queue.clear();
            j.queue.offer(ClipWriter.END);
            return false;
        }
        return true;
    }

    /** Drops whole groups of pictures from the head while the next keyframe is older than now − pre-roll. */
    @SuppressWarnings("ReferenceEquality") // ring entries are compared by identity, not by content
    private void trim(double now) {
        double keepFrom = now - preRollSeconds;
        while (true) {
            Entry second = null;
            boolean skippedFirst = false;
            for (Entry e : ring) {
                if (e.key()) {
                    if (skippedFirst) {
                        second = e;
                        break;
                    }
                    skippedFirst = true;
                }
            }
            boolean tooMany = ring.size() > MAX_RING_PACKETS;
            if (second == null || (second.seconds() > keepFrom && !tooMany)) {
                return;
            }
            while (ring.peekFirst() != second) {
                av_packet_free(ring.pollFirst().packet());
            }
            if (tooMany && second.seconds() > keepFrom) {
                LOG.warn("camera {}: pre-roll ring over {} packets; trimmed early", cameraId, MAX_RING_PACKETS);
            }
        }
    }

    private void endAll(String why) {
        for (Job j : jobs) {
            if (why != null) {
                LOG.info("camera {}: clip {} ends: {}", cameraId, j.file.getFileName(), why);
            }
            j.queue.offer(ClipWriter.END);
        }
        jobs.clear();
    }

    private void clearRing() {
        keyframeHeld = false;
        Entry e;
        while ((e = ring.pollFirst()) != null) {
            av_packet_free(e.packet());
        }
    }
}
