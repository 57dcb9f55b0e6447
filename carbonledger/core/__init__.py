"""The calculation core: inventory (from the route registry) -> matrices -> solve -> one scoring path -> one result
type."""
