"""The parts catalogue of stock (engine, no UI): the catalogue files, money between
currencies, the cheapest combination of catalogue parts and the project's copy of them."""
