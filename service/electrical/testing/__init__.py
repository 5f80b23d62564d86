"""Testing on site: the limits a tester must meet (the test sheet), and measured results judged against them."""
