package wayward.delivery;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import wayward.event.Event;

/** The last event phases in memory, newest last, for the status API. A local sink on its own thread. */
public final class RecentEvents implements EventSink {
    private final int capacity;
    private final ArrayDeque<Event> events = new ArrayDeque<>();

    public RecentEvents(int capacity) {
        this.capacity = capacity;
    }

    @Override
    public String name() {
        return "recent events";
    }

    @Override
    public synchronized void deliver(Event event) {
        if (events.size() == capacity) {
            events.removeFirst();
        }
        events.addLast(event);
    }

    /** Up to {@code limit} of the newest phases, oldest first. Any thread. */
    public synchronized List<Event> last(int limit) {
        List<Event> all = new ArrayList<>(events);
        return all.subList(Math.max(0, all.size() - limit), all.size());
    }
}
