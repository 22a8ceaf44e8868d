package wayward.delivery;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.event.Event;
import wayward.event.EventJson;

/**
 * Fans event phases out. Local sinks (event log, standard output) each have a bounded queue and thread;
 * network destinations (webhooks, MQTT) are fed from the durable {@link Outbox}: an outbox writer thread
 * appends each phase and forces it to disk, then every destination's {@link Courier} takes it from there.
 * {@link #publish} never blocks, so a slow or failing destination never delays analysis or the others. Only
 * a full in-memory queue (a stuck disk) drops a phase, and that is counted and logged.
 */
public final class EventBus implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(EventBus.class);

    private static final int WRITE_QUEUE = 10_000;

    private final List<Lane> lanes = new ArrayList<>();
    private final List<Courier> couriers = new ArrayList<>();
    private final AtomicLong notAccepted = new AtomicLong();
    private Outbox outbox;
    private BlockingQueue<byte[]> writeQueue;
    private Thread writer;
    private volatile boolean writerClosing;

    private static final class Lane {
        final EventSink sink;
        final BlockingQueue<Event> queue;
        final AtomicLong dropped = new AtomicLong();
        final AtomicLong delivered = new AtomicLong();
        final Thread thread;
        volatile boolean closing;

        Lane(EventSink sink, int capacity) {
            this.sink = sink;
            this.queue = new ArrayBlockingQueue<>(capacity);
            this.thread = new Thread(this::loop, "deliver-" + sink.name().replaceAll("[^A-Za-z0-9.-]+", "-"));
            this.thread.setDaemon(true);
        }

        void loop() {
            try {
                while (true) {
                    Event e = queue.poll(200, TimeUnit.MILLISECONDS);
                    if (e == null) {
                        if (closing && queue.isEmpty()) {
                            return;
                        }
                        continue;
                    }
                    try {
                        sink.deliver(e);
                        delivered.incrementAndGet();
                    } catch (InterruptedException ie) {
                        throw ie;
                    } catch (RuntimeException ex) {
                        LOG.error("{}: delivery of event {} failed: {}", sink.name(), e.id(), ex.toString());
                    }
                }
            } catch (InterruptedException ie) {
                Thread.currentThread().interrupt();
            }
        }
    }

    /** Adds a sink with a queue of {@code capacity} events and starts its thread. Before any publish. */
    public synchronized void add(EventSink sink, int capacity) {
        Lane lane = new Lane(sink, capacity);
        lanes.add(lane);
        lane.thread.start();
    }

    /**
     * Feeds network destinations from {@code outbox} from now on: starts the outbox writer thread. Before
     * {@link #add(Destination, long, long)} and any publish.
     */
    public synchronized void useOutbox(Outbox outbox) {
        this.outbox = outbox;
        this.writeQueue = new ArrayBlockingQueue<>(WRITE_QUEUE);
        this.writer = new Thread(this::write, "outbox-writer");
        this.writer.setDaemon(true);
        this.writer.start();
    }

    /** Adds a destination fed from the outbox and starts its courier. */
    public synchronized Courier add(Destination d, long baseBackoffMillis, long maxBackoffMillis) throws IOException {
        if (outbox == null) {
            throw new IllegalStateException("a destination needs the outbox");
        }
        Courier c = new Courier(outbox, d, baseBackoffMillis, maxBackoffMillis);
        couriers.add(c);
        c.start();
        return c;
    }

    public synchronized List<Courier> couriers() {
        return List.copyOf(couriers);
    }

    /** Event phases that never reached the outbox (its queue was full or the disk failed at shutdown). */
    public long notAccepted() {
        return notAccepted.get();
    }

    /** The outbox writer: batches what is queued, appends and forces it, retries a failing disk. */
    private void write() {
        List<byte[]> batch = new ArrayList<>();
        long failingSince = 0;
        try {
            while (true) {
                if (batch.isEmpty()) {
                    byte[] first = writeQueue.poll(200, TimeUnit.MILLISECONDS);
                    if (first == null) {
                        if (writerClosing) {
                            return;
                        }
                        continue;
                    }
                    batch.add(first);
                    writeQueue.drainTo(batch, 255);
                }
                try {
                    outbox.append(batch);
                    if (failingSince != 0) {
                        LOG.info("outbox: writing works again");
                        failingSince = 0;
                    }
                    batch.clear();
                } catch (IOException ex) {
                    if (failingSince == 0) {
                        failingSince = System.nanoTime();
                        LOG.error("outbox: cannot write to {} ({}); {} event phases held in memory, retrying",
                                outbox.folder(), ex.toString(), batch.size() + writeQueue.size());
                    }
                    if (writerClosing) {
                        notAccepted.addAndGet(batch.size() + writeQueue.size());
                        LOG.error("outbox: {} event phases could not be written before shutdown and are lost",
                                batch.size() + writeQueue.size());
                        return;
                    }
                    Thread.sleep(1000);
                }
            }
        } catch (InterruptedException ie) {
            Thread.currentThread().interrupt();
        }
    }

    /** Queues an event phase for every sink. Never blocks; any thread. */
    public void publish(Event e) {
        if (writeQueue != null) {
            if (!writeQueue.offer(EventJson.toJson(e).getBytes(StandardCharsets.UTF_8))) {
                long n = notAccepted.incrementAndGet();
                LOG.error("outbox: write queue full, event {} {} {} lost for webhooks and MQTT ({} so far)",
                        e.id(), e.kind().jsonName(), e.phase().jsonName(), n);
            }
        }
        for (Lane lane : lanes) {
            if (!lane.queue.offer(e)) {
                long n = lane.dropped.incrementAndGet();
                LOG.error("{}: queue full, event {} {} {} dropped ({} dropped so far)", lane.sink.name(),
                        e.id(), e.kind().jsonName(), e.phase().jsonName(), n);
            }
        }
    }

    /** Events delivered to all sinks together, for status and tests. */
    public long delivered() {
        long n = 0;
        for (Lane lane : lanes) {
            n += lane.delivered.get();
        }
        return n;
    }

    /**
     * Lets every sink finish its queue, waiting at most {@code timeoutMillis} overall, then closes the sinks.
     * What is still queued after that is reported in the log.
     */
    public void close(long timeoutMillis) {
        long deadline = System.nanoTime() + timeoutMillis * 1_000_000L;
        if (writer != null) {
            // first everything onto the disk, then the couriers get the rest of the time
            writerClosing = true;
            try {
                writer.join(Math.max(1, timeoutMillis / 2));
            } catch (InterruptedException ie) {
                Thread.currentThread().interrupt();
            }
            for (Courier c : couriers) {
                c.stopBy(deadline);
            }
            for (Courier c : couriers) {
                c.awaitStop(deadline);
            }
            outbox.close();
        }
        for (Lane lane : lanes) {
            lane.closing = true;
        }
        for (Lane lane : lanes) {
            try {
                long left = Math.max(1, (deadline - System.nanoTime()) / 1_000_000L);
                lane.thread.join(left);
            } catch (InterruptedException ie) {
                Thread.currentThread().interrupt();
                break;
            }
            if (lane.thread.isAlive()) {
                lane.thread.interrupt();
                LOG.warn("{}: {} event phases not delivered at shutdown", lane.sink.name(), lane.queue.size());
            }
            lane.sink.close();
        }
    }

    @Override
    public void close() {
        close(10_000);
    }
}
