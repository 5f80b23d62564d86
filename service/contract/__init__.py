"""The contract shared by the HTTP layer and the CLI: the request and result schemas, the loaders that read
bodies and files into the core's inputs, the problem records of what could not be read, and the batch
iterator with its writers. It knows no request and no file: it maps JSON onto the core and back."""
